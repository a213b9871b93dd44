/**
 * The permission policy on its own. The expected answers are the role definitions in the
 * product brief (lead, grower, contributor, viewer, anyone for published results, instance
 * administrators), restated here as a table; no outside standard defines them.
 */
import { describe, expect, it } from 'vitest';
import {
  type Actor,
  can,
  canGroup,
  canInstance,
  canRemoveMember,
  canRequestSeed,
  groupActions,
  groupPermissionTable,
  groupPermissionTableMarkdown,
  permissionsFor,
  permissionTable,
  permissionTableMarkdown,
  type TrialAccess,
  type TrialAction,
  trialActions,
  type TrialRole,
} from '../../common/policy';

const member: Actor = { userId: 'u-1', isAdmin: false };
const admin: Actor = { userId: 'u-admin', isAdmin: true };
const access = (
  role: TrialRole | null,
  status: TrialAccess['status'] = 'active',
  sites: string[] | null = null,
): TrialAccess => ({
  status,
  role,
  growerSiteIds: sites,
});

const expected: Record<TrialAction, TrialRole[]> = {
  'trial.read': ['lead', 'grower', 'contributor', 'viewer'],
  'trial.edit': ['lead'],
  'trial.delete': ['lead'],
  'trial.publish': ['lead'],
  'members.manage': ['lead'],
  'members.add': [],
  'records.write': ['lead', 'grower'],
  'photos.upload': ['lead', 'grower', 'contributor'],
  'notes.write': ['lead', 'grower', 'contributor'],
  'results.read': ['lead', 'grower', 'contributor', 'viewer'],
};

describe('can(actor, action, trial)', () => {
  for (const action of trialActions) {
    for (const role of ['lead', 'grower', 'contributor', 'viewer'] as const) {
      const allowed = expected[action].includes(role);
      it(`${role} ${allowed ? 'may' : 'may not'} ${action} on an unpublished trial`, () => {
        expect(can(member, action, access(role))).toBe(allowed);
      });
    }
  }

  it('lets nobody outside an unpublished trial do anything, signed in or not', () => {
    for (const action of trialActions) {
      expect(can(null, action, access(null))).toBe(false);
      expect(can(member, action, access(null))).toBe(false);
    }
  });

  it('lets anyone read a published results sheet, and nothing more', () => {
    for (const action of trialActions) {
      expect(can(null, action, access(null, 'published'))).toBe(action === 'results.read');
      expect(can(member, action, access(null, 'published'))).toBe(action === 'results.read');
    }
  });

  it('lets an instance administrator do everything on any trial, including the direct add', () => {
    for (const action of trialActions) expect(can(admin, action, access(null))).toBe(true);
  });

  it('limits a grower’s records to the assigned sites, and leaves an unlimited grower free', () => {
    const limited = access('grower', 'active', ['site-a']);
    expect(can(member, 'records.write', limited, 'site-a')).toBe(true);
    expect(can(member, 'records.write', limited, 'site-b')).toBe(false);
    // Reading is never limited by site.
    expect(can(member, 'trial.read', limited, 'site-b')).toBe(true);
    expect(can(member, 'records.write', access('grower'), 'site-b')).toBe(true);
    // The site list only binds growers (a lead with stray rows is still a lead).
    expect(can(member, 'records.write', access('lead', 'active', ['site-a']), 'site-b')).toBe(true);
  });
});

describe('permissionsFor', () => {
  it('answers every action, the same as can()', () => {
    const p = permissionsFor(member, access('contributor'));
    expect(Object.keys(p).sort()).toEqual([...trialActions].sort());
    for (const action of trialActions)
      expect(p[action]).toBe(can(member, action, access('contributor')));
  });
});

describe('removing members', () => {
  it('lets a lead remove anyone, any member leave, and nobody else remove others', () => {
    expect(canRemoveMember(member, access('lead'), 'someone')).toBe(true);
    expect(canRemoveMember(member, access('viewer'), 'u-1')).toBe(true);
    expect(canRemoveMember(member, access('grower'), 'someone')).toBe(false);
    expect(canRemoveMember(member, access(null), 'u-1')).toBe(false);
    expect(canRemoveMember(null, access('lead'), 'someone')).toBe(false);
    expect(canRemoveMember(admin, access(null), 'someone')).toBe(true);
  });
});

describe('instance actions', () => {
  it('lets any signed-in person create a trial and only administrators administer', () => {
    expect(canInstance(null, 'trial.create')).toBe(false);
    expect(canInstance(member, 'trial.create')).toBe(true);
    expect(canInstance(member, 'instance.admin')).toBe(false);
    expect(canInstance(admin, 'instance.admin')).toBe(true);
  });
});

describe('the permission table for the README', () => {
  it('has one row per action that agrees with the policy', () => {
    const md = permissionTableMarkdown().split('\n');
    expect(md).toHaveLength(2 + trialActions.length);
    for (const action of trialActions) {
      const row = md.find((l) => l.startsWith(`| \`${action}\` |`))!;
      const cells = row
        .split('|')
        .slice(2, 6)
        .map((c) => c.trim());
      expect(cells).toEqual(
        (['lead', 'grower', 'contributor', 'viewer'] as const).map((r) =>
          permissionTable[action][r] ? 'yes' : '—',
        ),
      );
    }
  });
});

describe('group actions', () => {
  it('lets coordinators manage the register and start trials, members only read, outsiders nothing', () => {
    expect(canGroup(member, 'register.read', 'member')).toBe(true);
    expect(canGroup(member, 'register.edit', 'member')).toBe(false);
    expect(canGroup(member, 'group.trial.create', 'member')).toBe(false);
    expect(canGroup(member, 'register.edit', 'coordinator')).toBe(true);
    expect(canGroup(member, 'group.trial.create', 'coordinator')).toBe(true);
    expect(canGroup(member, 'register.read', null)).toBe(false);
    expect(canGroup(null, 'register.read', null)).toBe(false);
    expect(canGroup(admin, 'register.edit', null)).toBe(true);
  });

  it('lets coordinators keep and offer seed, members read lots and ask for packets', () => {
    expect(canGroup(member, 'seed.read', 'member')).toBe(true);
    expect(canGroup(member, 'seed.edit', 'member')).toBe(false);
    expect(canGroup(member, 'seed.edit', 'coordinator')).toBe(true);
    expect(canGroup(member, 'seed.read', null)).toBe(false);
    const closed = { requestsOpen: false };
    const open = { requestsOpen: true };
    expect(canRequestSeed(member, 'member', closed, false)).toBe(true);
    expect(canRequestSeed(member, null, closed, true)).toBe(false);
    expect(canRequestSeed(member, null, open, true)).toBe(true);
    expect(canRequestSeed(member, null, open, false)).toBe(false);
    expect(canRequestSeed(null, null, open, false)).toBe(false);
  });

  it('has one README row per group action that agrees with the policy', () => {
    const md = groupPermissionTableMarkdown().split('\n');
    expect(md).toHaveLength(2 + groupActions.length);
    for (const action of groupActions) {
      const cells = md
        .find((l) => l.startsWith(`| \`${action}\` |`))!
        .split('|')
        .slice(2, 4)
        .map((c) => c.trim());
      expect(cells).toEqual(
        (['coordinator', 'member'] as const).map((r) =>
          groupPermissionTable[action][r] ? 'yes' : '—',
        ),
      );
    }
  });
});
