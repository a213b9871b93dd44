import crypto from 'node:crypto';
import { type Kysely, sql } from 'kysely';

// Frozen. The layer above single trials: a group (a seed library, a grower network) owns
// trials and keeps one register of varieties, so the same variety can be followed from one
// trial and season to the next. Each existing trial goes to a group of its owner (who made
// it, else its first lead), and its entries are linked to register varieties made from their
// names, one variety per exact name within a group.

const tailAlphabet = 'abcdefghjkmnpqrstuvwxyz23456789';

/** Words of a name and a random tail, as trial addresses are made (a taken name reveals nothing). */
function addressOf(name: string, fallback: string): string {
  const base =
    name
      .normalize('NFKD')
      .replace(/[\u0300-\u036f]/g, '')
      .toLowerCase()
      .replace(/[^a-z0-9]+/g, '-')
      .replace(/^-+|-+$/g, '')
      .slice(0, 60)
      .replace(/-+$/g, '') || fallback;
  let tail = '';
  for (let i = 0; i < 6; i++) tail += tailAlphabet[crypto.randomInt(tailAlphabet.length)];
  return `${base}-${tail}`;
}

const varietyTypeOfEntry: Record<string, string> = {
  heirloom: 'heirloom',
  open_pollinated: 'open_pollinated',
  hybrid: 'hybrid',
};

export async function up(db: Kysely<any>): Promise<void> {
  await sql`
    create table groups (
      id uuid primary key default gen_random_uuid(),
      slug text not null unique check (slug ~ '^[a-z0-9]+(-[a-z0-9]+)*$' and char_length(slug) <= 80),
      name text not null check (char_length(name) between 1 and 120),
      created_at timestamptz not null default now(),
      updated_at timestamptz not null default now(),
      created_by text references users (id) on delete set null,
      updated_by text references users (id) on delete set null
    );

    create table group_members (
      group_id uuid not null references groups (id) on delete cascade,
      user_id text not null references users (id) on delete cascade,
      role text not null check (role in ('coordinator', 'member')),
      created_at timestamptz not null default now(),
      updated_at timestamptz not null default now(),
      created_by text references users (id) on delete set null,
      updated_by text references users (id) on delete set null,
      primary key (group_id, user_id)
    );

    create table varieties (
      id uuid primary key default gen_random_uuid(),
      group_id uuid not null references groups (id) on delete cascade,
      slug text not null unique check (slug ~ '^[a-z0-9]+(-[a-z0-9]+)*$' and char_length(slug) <= 80),
      name text not null check (char_length(name) between 1 and 120),
      crop text not null check (char_length(crop) between 1 and 80),
      variety_type text not null default 'unknown'
        check (variety_type in ('open_pollinated', 'heirloom', 'hybrid', 'unknown')),
      origin text not null default '' check (char_length(origin) <= 500),
      seed_source text not null default '' check (char_length(seed_source) <= 200),
      description text not null default '' check (char_length(description) <= 2000),
      expected_traits text[] not null default '{}' check (cardinality(expected_traits) <= 20),
      aliases text[] not null default '{}' check (cardinality(aliases) <= 20),
      created_at timestamptz not null default now(),
      updated_at timestamptz not null default now(),
      created_by text references users (id) on delete set null,
      updated_by text references users (id) on delete set null,
      unique (group_id, name)
    );
    create index varieties_group_idx on varieties (group_id);

    create trigger groups_touch before update on groups
      for each row execute function rowtally_touch_updated_at();
    create trigger group_members_touch before update on group_members
      for each row execute function rowtally_touch_updated_at();
    create trigger varieties_touch before update on varieties
      for each row execute function rowtally_touch_updated_at();

    alter table trials add column group_id uuid references groups (id) on delete restrict;
    create index trials_group_idx on trials (group_id);
    alter table entries add column variety_id uuid references varieties (id) on delete set null;
    create index entries_variety_idx on entries (variety_id);
  `.execute(db);

  // Each trial's owner: who made it, else its earliest lead; trials with neither share one group.
  const trials = await sql<{
    id: string;
    crop: string;
    owner: string | null;
    owner_name: string | null;
  }>`
    select t.id, t.crop, u.id as owner, u.name as owner_name
    from trials t
    left join lateral (
      select coalesce(
        (select id from users where id = t.created_by),
        (select m.user_id from trial_members m where m.trial_id = t.id and m.role = 'lead'
          order by m.created_at, m.user_id limit 1)
      ) as owner_id
    ) o on true
    left join users u on u.id = o.owner_id
    order by t.created_at, t.id`.execute(db);

  const groupOf = new Map<string, string>();
  for (const t of trials.rows) {
    const key = t.owner ?? '';
    let groupId = groupOf.get(key);
    if (!groupId) {
      const name = t.owner_name ? `${t.owner_name}'s trials`.slice(0, 120) : 'Shared trials';
      const row = await sql<{ id: string }>`
        insert into groups (slug, name, created_by, updated_by)
        values (${addressOf(name, 'group')}, ${name}, ${t.owner}, ${t.owner}) returning id`.execute(
        db,
      );
      groupId = row.rows[0]!.id;
      groupOf.set(key, groupId);
      if (t.owner)
        await sql`insert into group_members (group_id, user_id, role, created_by)
          values (${groupId}, ${t.owner}, 'coordinator', ${t.owner})`.execute(db);
    }
    await sql`update trials set group_id = ${groupId} where id = ${t.id}`.execute(db);
  }

  // Everyone in a group's trials is a member of the group (its owner coordinates it).
  await sql`
    insert into group_members (group_id, user_id, role)
    select distinct t.group_id, m.user_id, 'member'
    from trial_members m join trials t on t.id = m.trial_id
    where t.group_id is not null
    on conflict (group_id, user_id) do nothing`.execute(db);

  // One register variety per exact entry name within a group, described by its earliest entry.
  const names = await sql<{
    group_id: string;
    name: string;
    crop: string;
    entry_type: string;
    seed_source: string;
    created_by: string | null;
  }>`
    select distinct on (t.group_id, e.name)
      t.group_id, e.name, t.crop, e.entry_type, e.seed_source, e.created_by
    from entries e join trials t on t.id = e.trial_id
    order by t.group_id, e.name, e.created_at, e.id`.execute(db);
  for (const n of names.rows) {
    const exists = await sql`select 1 from users where id = ${n.created_by}`.execute(db);
    const by = exists.rows.length ? n.created_by : null;
    await sql`
      insert into varieties (group_id, slug, name, crop, variety_type, seed_source, created_by, updated_by)
      values (${n.group_id}, ${addressOf(n.name, 'variety')}, ${n.name}, ${n.crop},
        ${varietyTypeOfEntry[n.entry_type] ?? 'unknown'}, ${n.seed_source}, ${by}, ${by})`.execute(
      db,
    );
  }
  await sql`
    update entries e set variety_id = v.id
    from trials t, varieties v
    where t.id = e.trial_id and v.group_id = t.group_id and v.name = e.name`.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await sql`
    alter table entries drop column variety_id;
    alter table trials drop column group_id;
    drop table varieties;
    drop table group_members;
    drop table groups;
  `.execute(db);
}
