import { type Member, roleDescriptions, roleLabels } from '@common/contracts/members';
import { trialRoles } from '@common/contracts/trials';
import { useId, useState } from 'react';
import { Button } from '@/components/ui/button';
import { FormMessage } from '@/components/ui/text-field';
import { useRemoveMember, useUpdateMember } from '../api/change-member';
import { SitePicker } from './site-picker';

export function MemberCard({
  slug,
  member,
  sites,
  onLeft,
}: {
  slug: string;
  member: Member;
  sites: { id: string; name: string }[];
  onLeft: () => void;
}) {
  const id = useId();
  const [role, setRole] = useState(member.role);
  const [siteIds, setSiteIds] = useState(member.siteIds);
  const [confirming, setConfirming] = useState(false);
  const update = useUpdateMember(slug);
  const remove = useRemoveMember(slug);
  const changed =
    role !== member.role || [...siteIds].sort().join() !== [...member.siteIds].sort().join();
  const siteNames = member.siteIds
    .map((s) => sites.find((x) => x.id === s)?.name)
    .filter(Boolean)
    .join(', ');

  const save = () =>
    update.mutate({
      userId: member.userId,
      body: { role, siteIds: role === 'grower' ? siteIds : [] },
    });
  const doRemove = async () => {
    await remove.mutateAsync(member.userId);
    if (member.isYou) onLeft();
  };

  return (
    <li className="rounded-lg bg-white p-3 shadow-sm" aria-labelledby={`${id}-name`}>
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <p id={`${id}-name`} className="font-semibold">
          {member.name}
          {member.isYou ? <span className="text-loam-700"> (you)</span> : null}
        </p>
        <p className="text-sm text-loam-700 break-all">{member.email}</p>
      </div>
      <p className="mt-1 text-sm">
        {roleLabels[member.role]}
        {member.role === 'grower' ? ` · ${siteNames || 'every site'}` : ''}
      </p>
      <div className="mt-3 flex flex-col gap-3">
        <div className="flex flex-col gap-1">
          <label htmlFor={`${id}-role`} className="font-medium">
            Role of {member.name}
          </label>
          <select
            id={`${id}-role`}
            aria-describedby={`${id}-role-hint`}
            className="min-h-11 rounded-lg border border-leaf-300 bg-white px-2"
            value={role}
            onChange={(e) => setRole(e.target.value as Member['role'])}
          >
            {trialRoles.map((r) => (
              <option key={r} value={r}>
                {roleLabels[r]}
              </option>
            ))}
          </select>
          <span id={`${id}-role-hint`} className="text-sm text-loam-700">
            {roleDescriptions[role]}
          </span>
        </div>
        {role === 'grower' ? (
          <SitePicker sites={sites} value={siteIds} onChange={setSiteIds} />
        ) : null}
        {update.error ? <FormMessage tone="error">{update.error.message}</FormMessage> : null}
        {remove.error ? <FormMessage tone="error">{remove.error.message}</FormMessage> : null}
        <div className="flex flex-wrap gap-2">
          <Button onClick={save} disabled={!changed || update.isPending}>
            {update.isPending ? 'Saving…' : 'Save changes'}
          </Button>
          {confirming ? (
            <>
              <Button variant="danger" onClick={doRemove} disabled={remove.isPending}>
                {member.isYou ? 'Yes, leave the trial' : `Yes, remove ${member.name}`}
              </Button>
              <Button variant="ghost" onClick={() => setConfirming(false)}>
                Keep
              </Button>
            </>
          ) : (
            <Button variant="secondary" onClick={() => setConfirming(true)}>
              {member.isYou ? 'Leave the trial' : 'Remove from trial'}
            </Button>
          )}
        </div>
      </div>
    </li>
  );
}
