import { type CreateInvitationBody, createInvitationBody } from '@common/contracts/invitations';
import { roleDescriptions, roleLabels } from '@common/contracts/members';
import { trialRoles } from '@common/contracts/trials';
import { zodResolver } from '@hookform/resolvers/zod';
import { useId, useState } from 'react';
import { Controller, useForm } from 'react-hook-form';
import type { z } from 'zod';
import { Button } from '@/components/ui/button';
import { FormMessage, TextField } from '@/components/ui/text-field';
import { showServerErrors } from '@/lib/form-errors';
import { useCreateInvitation } from '../api/invitations';
import { SitePicker } from './site-picker';

export function InviteForm({
  slug,
  sites,
}: {
  slug: string;
  sites: { id: string; name: string }[];
}) {
  const id = useId();
  const create = useCreateInvitation(slug);
  const [result, setResult] = useState<{ tone: 'ok' | 'error'; text: string } | null>(null);
  const form = useForm<z.input<typeof createInvitationBody>, unknown, CreateInvitationBody>({
    resolver: zodResolver(createInvitationBody),
    defaultValues: { email: '', role: 'grower', siteIds: [] },
  });
  const { errors, isSubmitting } = form.formState;
  const role = form.watch('role');

  const onSubmit = form.handleSubmit(async (values) => {
    setResult(null);
    try {
      const inv = await create.mutateAsync(values);
      form.reset({ email: '', role: values.role, siteIds: [] });
      // The letter is queued with the invitation; "Mail from this trial" shows when it went.
      setResult({ tone: 'ok', text: `Invitation to ${inv.email} saved; the mail is on its way.` });
    } catch (err) {
      if (!showServerErrors(err, form.setError, { topLevel: true }))
        setResult({ tone: 'error', text: err instanceof Error ? err.message : 'Not sent.' });
    }
  });

  return (
    <form
      aria-labelledby={`${id}-heading`}
      onSubmit={onSubmit}
      noValidate
      className="flex flex-col gap-4 rounded-xl bg-white p-4 shadow-sm"
    >
      <h2 id={`${id}-heading`} className="text-xl font-semibold text-leaf-900">
        Invite someone
      </h2>
      <TextField
        label="Their e-mail address"
        type="email"
        autoComplete="off"
        error={errors.email?.message}
        {...form.register('email')}
      />
      <div className="flex flex-col gap-1">
        <label htmlFor={`${id}-role`} className="font-medium">
          Role
        </label>
        <select
          id={`${id}-role`}
          aria-describedby={`${id}-role-hint`}
          className="min-h-11 rounded-lg border border-leaf-300 bg-white px-2"
          {...form.register('role')}
        >
          {trialRoles.map((r) => (
            <option key={r} value={r}>
              {roleLabels[r]}
            </option>
          ))}
        </select>
        <span id={`${id}-role-hint`} className="text-sm text-loam-700">
          {roleDescriptions[role ?? 'grower']}
        </span>
      </div>
      {role === 'grower' ? (
        <Controller
          control={form.control}
          name="siteIds"
          render={({ field }) => (
            <SitePicker sites={sites} value={field.value ?? []} onChange={field.onChange} />
          )}
        />
      ) : null}
      {errors.siteIds?.message ? (
        <FormMessage tone="error">{errors.siteIds.message}</FormMessage>
      ) : null}
      {result ? <FormMessage tone={result.tone}>{result.text}</FormMessage> : null}
      <Button type="submit" disabled={isSubmitting} className="self-start">
        {isSubmitting ? 'Sending the invitation…' : 'Send invitation'}
      </Button>
      <p className="text-sm text-loam-700">The link in the mail works once, for 7 days.</p>
    </form>
  );
}
