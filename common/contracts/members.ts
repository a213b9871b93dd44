import { z } from 'zod';
import { emailSchema } from './auth';
import { trialRoles, trialSlugParams } from './trials';

export const roleLabels: Record<(typeof trialRoles)[number], string> = {
  lead: 'Lead',
  grower: 'Grower',
  contributor: 'Contributor',
  viewer: 'Viewer',
};

export const roleDescriptions: Record<(typeof trialRoles)[number], string> = {
  lead: 'Everything on the trial: design, members, publishing, deleting.',
  grower:
    'Records harvests, measurements and field events (at the sites you choose); reads the whole trial.',
  contributor: 'Adds photos and notes; reads the trial.',
  viewer: 'Reads the trial before it is published.',
};

/**
 * Sites a grower is limited to. Empty or absent means every site; other roles take none.
 */
export const siteIdsSchema = z.array(z.uuid('Not a site id.')).max(200).default([]);

export const memberParams = trialSlugParams.extend({
  userId: z.string().min(1).max(64),
});

export const memberSchema = z.object({
  userId: z.string(),
  name: z.string(),
  email: z.string(),
  role: z.enum(trialRoles),
  /** Empty means every site (only growers are ever limited). */
  siteIds: z.array(z.string()),
  joinedAt: z.string(),
  isYou: z.boolean(),
});
export type Member = z.infer<typeof memberSchema>;

export const memberListSchema = z.object({
  trial: z.object({ slug: z.string(), title: z.string() }),
  sites: z.array(z.object({ id: z.string(), name: z.string() })),
  members: z.array(memberSchema),
  leadCount: z.number().int(),
});
export type MemberList = z.infer<typeof memberListSchema>;

const onlyGrowersHaveSites = (v: { role: string; siteIds: string[] }) =>
  v.role === 'grower' || v.siteIds.length === 0;
const sitesMessage = {
  path: ['siteIds'],
  message: 'Only growers are limited to sites; leave the sites empty for this role.',
};

export const updateMemberBody = z
  .object({ role: z.enum(trialRoles), siteIds: siteIdsSchema })
  .refine(onlyGrowersHaveSites, sitesMessage);
export type UpdateMemberBody = z.infer<typeof updateMemberBody>;

/** Administrators only: put an existing account straight into a trial (recovery). */
export const addMemberBody = z
  .object({ email: emailSchema, role: z.enum(trialRoles), siteIds: siteIdsSchema })
  .refine(onlyGrowersHaveSites, sitesMessage);
export type AddMemberBody = z.infer<typeof addMemberBody>;
