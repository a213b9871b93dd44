import { type Kysely, sql } from 'kysely';

// Frozen. Field records: who changed what (audit log) and the inputs behind a computed depth
// of irrigation water.
export async function up(db: Kysely<any>): Promise<void> {
  await sql`
    create table audit_log (
      id bigint generated always as identity primary key,
      trial_id uuid not null references trials (id) on delete cascade,
      table_name text not null check (table_name in ('harvests', 'observations', 'field_events', 'plots')),
      record_id uuid not null,
      action text not null check (action in ('create', 'update', 'delete', 'restore')),
      before jsonb,
      after jsonb,
      actor_id text references users (id) on delete set null,
      at timestamptz not null default now(),
      -- a create has nothing before it; every other action starts from a stored record
      check ((action = 'create') = (before is null)),
      check (after is not null)
    );
    create index audit_log_trial_idx on audit_log (trial_id, at desc);
    create index audit_log_record_idx on audit_log (record_id, at);

    alter table field_events
      add column drip_emitter_flow_l_per_h finite_float check (drip_emitter_flow_l_per_h > 0),
      add column drip_emitter_spacing_mm finite_float check (drip_emitter_spacing_mm > 0),
      add column drip_line_flow_l_per_h_per_m finite_float check (drip_line_flow_l_per_h_per_m > 0),
      add column wetted_width_mm finite_float check (wetted_width_mm > 0),
      add column sprinkler_rate_mm_per_h finite_float check (sprinkler_rate_mm_per_h > 0),
      add column hand_volume_l finite_float check (hand_volume_l > 0),
      add column wetted_area_m2 finite_float check (wetted_area_m2 > 0),
      -- the depth is stored with whatever it was computed from (checked by the service)
      add check (kind <> 'irrigation' or water_depth_mm is not null);
  `.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
  await sql`
    alter table field_events
      drop column drip_emitter_flow_l_per_h,
      drop column drip_emitter_spacing_mm,
      drop column drip_line_flow_l_per_h_per_m,
      drop column wetted_width_mm,
      drop column sprinkler_rate_mm_per_h,
      drop column hand_volume_l,
      drop column wetted_area_m2;
    drop table audit_log;
  `.execute(db);
}
