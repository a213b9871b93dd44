/**
 * Who may do what. The server calls `can` on every route; the client receives the answers for
 * the current user (GET /api/trials/:slug → `permissions`) and only hides what it cannot do.
 */
import type { trialRoles } from './contracts/trials';
import type { GroupRole } from './contracts/varieties';

export type TrialRole = (typeof trialRoles)[number];

export interface Actor {
  userId: string;
  isAdmin: boolean;
}

export interface TrialAccess {
  status: 'draft' | 'active' | 'closed' | 'published';
  role: TrialRole | null;
  /** Sites a grower is limited to; null means every site of the trial. */
  growerSiteIds: string[] | null;
}

export const trialActions = [
  'trial.read',
  'trial.edit',
  'trial.delete',
  'trial.publish',
  'members.manage',
  'members.add',
  'records.write',
  'photos.upload',
  'notes.write',
  'results.read',
] as const;
export type TrialAction = (typeof trialActions)[number];

type Rule = Record<TrialRole, boolean> & { anyone: boolean };

/** The permission table (also in the README). `anyone` includes signed-out readers. */
export const permissionTable: Record<TrialAction, Rule & { note: string }> = {
  'trial.read': {
    lead: true,
    grower: true,
    contributor: true,
    viewer: true,
    anyone: false,
    note: 'design, records, photos and analysis of an unpublished trial',
  },
  'trial.edit': {
    lead: true,
    grower: false,
    contributor: false,
    viewer: false,
    anyone: false,
    note: 'entries, sites, traits, layout, trial settings',
  },
  'trial.delete': {
    lead: true,
    grower: false,
    contributor: false,
    viewer: false,
    anyone: false,
    note: 'delete the trial',
  },
  'trial.publish': {
    lead: true,
    grower: false,
    contributor: false,
    viewer: false,
    anyone: false,
    note: 'results sheet, publish and unpublish',
  },
  'members.manage': {
    lead: true,
    grower: false,
    contributor: false,
    viewer: false,
    anyone: false,
    note: 'invite, resend or revoke invitations, change roles and sites, remove members',
  },
  'members.add': {
    lead: false,
    grower: false,
    contributor: false,
    viewer: false,
    anyone: false,
    note: 'put an existing account straight into the trial, any role (administrators: recovery)',
  },
  'records.write': {
    lead: true,
    grower: true,
    contributor: false,
    viewer: false,
    anyone: false,
    note: 'harvests, measurements, field events (growers: their sites only)',
  },
  'photos.upload': {
    lead: true,
    grower: true,
    contributor: true,
    viewer: false,
    anyone: false,
    note: 'upload and tag photos',
  },
  'notes.write': {
    lead: true,
    grower: true,
    contributor: true,
    viewer: false,
    anyone: false,
    note: 'plot notes',
  },
  'results.read': {
    lead: true,
    grower: true,
    contributor: true,
    viewer: true,
    anyone: true,
    note: 'the published results sheet (anyone once published)',
  },
};

/**
 * A group (an organisation owning several trials) has roles of its own; they grant nothing
 * inside a trial, where the trial's roles decide.
 */
export const groupActions = [
  'register.read',
  'register.edit',
  'group.trial.create',
  'seed.read',
  'seed.edit',
  'seed.request',
] as const;
export type GroupAction = (typeof groupActions)[number];

export const groupPermissionTable: Record<
  GroupAction,
  Record<GroupRole, boolean> & {
    note: string;
    /** Who else may, beyond the group's people (the permission table's "anyone" column). */
    anyone?: string;
  }
> = {
  'register.read': {
    coordinator: true,
    member: true,
    note: "the group's variety register and each variety's record (figures: per trial, as the trial's roles allow)",
  },
  'register.edit': {
    coordinator: true,
    member: false,
    note: 'add and edit register varieties',
  },
  'group.trial.create': {
    coordinator: true,
    member: false,
    note: 'start a trial owned by the group',
  },
  'seed.read': {
    coordinator: true,
    member: true,
    note: 'seed lots, germination tests and the stand of the plots sown from each lot',
  },
  'seed.edit': {
    coordinator: true,
    member: false,
    note: 'lots, germination tests, the germination threshold, offers of seed and answering requests',
  },
  'seed.request': {
    coordinator: true,
    member: true,
    note: 'ask for a packet of offered seed (anyone with a confirmed e-mail too, when the group allows)',
    anyone: 'confirmed e-mail, if the group allows',
  },
};

/**
 * Asking for offered seed: the group's people, and anyone signed in with a confirmed e-mail
 * when the group opens its offers to them.
 */
export function canRequestSeed(
  actor: Actor | null,
  role: GroupRole | null,
  group: { requestsOpen: boolean },
  emailVerified: boolean,
): boolean {
  if (canGroup(actor, 'seed.request', role)) return true;
  return actor !== null && group.requestsOpen && emailVerified;
}

export function canGroup(
  actor: Actor | null,
  action: GroupAction,
  role: GroupRole | null,
): boolean {
  if (actor?.isAdmin) return true;
  if (!actor || !role) return false;
  return groupPermissionTable[action][role];
}

/** The group permission table as Markdown, for the README. */
export function groupPermissionTableMarkdown(): string {
  const yes = (b: boolean) => (b ? 'yes' : '—');
  const rows = groupActions.map((a) => {
    const r = groupPermissionTable[a];
    return `| \`${a}\` | ${yes(r.coordinator)} | ${yes(r.member)} | ${r.anyone ?? '—'} | yes | ${r.note} |`;
  });
  return [
    '| group action | coordinator | member | anyone | admin | what it covers |',
    '| --- | --- | --- | --- | --- | --- |',
    ...rows,
  ].join('\n');
}

/** Instance-wide actions, not tied to one trial. */
export type InstanceAction = 'trial.create' | 'instance.admin';

export function canInstance(actor: Actor | null, action: InstanceAction): boolean {
  if (!actor) return false;
  if (action === 'trial.create') return true;
  return actor.isAdmin;
}

export function can(
  actor: Actor | null,
  action: TrialAction,
  trial: TrialAccess,
  siteId?: string,
): boolean {
  // Whoever runs the server can recover any trial (a lead who left, a lost account).
  if (actor?.isAdmin) return true;
  const rule = permissionTable[action];
  if (action === 'results.read' && trial.status === 'published') return true;
  if (!actor || !trial.role) return false;
  if (!rule[trial.role]) return false;
  if (
    action === 'records.write' &&
    trial.role === 'grower' &&
    trial.growerSiteIds &&
    siteId !== undefined
  ) {
    return trial.growerSiteIds.includes(siteId);
  }
  return true;
}

export function permissionsFor(
  actor: Actor | null,
  trial: TrialAccess,
): Record<TrialAction, boolean> {
  return Object.fromEntries(trialActions.map((a) => [a, can(actor, a, trial)])) as Record<
    TrialAction,
    boolean
  >;
}

/**
 * Removing someone from a trial: leads (and administrators) remove anyone; every member may
 * leave. Whether a lead would remain is the service's check, under a lock.
 */
export function canRemoveMember(
  actor: Actor | null,
  trial: TrialAccess,
  targetUserId: string,
): boolean {
  if (!actor) return false;
  if (can(actor, 'members.manage', trial)) return true;
  return trial.role !== null && actor.userId === targetUserId;
}

const roleColumns = ['lead', 'grower', 'contributor', 'viewer'] as const satisfies TrialRole[];

/** The permission table as Markdown, for the README. */
export function permissionTableMarkdown(): string {
  const yes = (b: boolean) => (b ? 'yes' : '—');
  const head =
    '| action | lead | grower | contributor | viewer | anyone | admin | what it covers |';
  const rule = '| --- | --- | --- | --- | --- | --- | --- | --- |';
  const rows = trialActions.map((a) => {
    const r = permissionTable[a];
    const anyone = a === 'results.read' ? 'once published' : yes(r.anyone);
    return `| \`${a}\` | ${roleColumns.map((c) => yes(r[c])).join(' | ')} | ${anyone} | yes | ${r.note} |`;
  });
  return [head, rule, ...rows].join('\n');
}
