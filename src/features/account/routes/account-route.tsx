import { changePasswordForm } from '@common/contracts/auth';
import { type Me, unitSystems, updateMeBody } from '@common/contracts/me';
import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { Button } from '@/components/ui/button';
import { Spinner } from '@/components/ui/spinner';
import {
  ConfirmPasswordField,
  NameField,
  NewPasswordField,
  PasswordField,
} from '@/components/ui/account-fields';
import { FormMessage } from '@/components/ui/text-field';
import { ApiError } from '@/lib/api-client';
import { showServerErrors } from '@/lib/form-errors';
import { authClient } from '@/lib/auth-client';
import { authErrorMessage } from '@/lib/auth-error-message';
import { useMe } from '@/lib/session';
import { useUpdateMe } from '../api/update-me';

const unitLabels: Record<(typeof unitSystems)[number], string> = {
  metric: 'Metric (g, kg, mm, cm, m, m², °C)',
  us: 'US customary (oz, lb, in, ft, ft², °F)',
};

const profileForm = updateMeBody.required();

function ProfileSection({ me }: { me: Me }) {
  const update = useUpdateMe();
  const [saved, setSaved] = useState(false);
  const form = useForm<z.input<typeof profileForm>, unknown, z.output<typeof profileForm>>({
    resolver: zodResolver(profileForm),
    defaultValues: { name: me.name, unitSystem: me.unitSystem },
  });
  const { errors, isSubmitting } = form.formState;
  const onSubmit = form.handleSubmit(async (values) => {
    setSaved(false);
    try {
      await update.mutateAsync(values);
      setSaved(true);
    } catch (err) {
      showServerErrors(err, form.setError);
    }
  });
  return (
    <section aria-labelledby="profile-heading" className="rounded-xl bg-white p-4 shadow-sm sm:p-6">
      <h2 id="profile-heading" className="text-xl font-semibold text-leaf-900">
        Name and units
      </h2>
      <form onSubmit={onSubmit} noValidate className="mt-3 flex flex-col gap-4">
        <NameField error={errors.name?.message} {...form.register('name')} />
        <fieldset className="flex flex-col gap-2">
          <legend className="font-medium">Units for entering and reading numbers</legend>
          {unitSystems.map((u) => (
            <label key={u} className="flex min-h-11 items-center gap-3">
              <input
                type="radio"
                value={u}
                className="h-5 w-5 accent-leaf-700"
                {...form.register('unitSystem')}
              />
              {unitLabels[u]}
            </label>
          ))}
          <p className="text-sm text-loam-700">
            Records are stored in metric either way; this only changes what you see and type.
          </p>
        </fieldset>
        {saved ? <FormMessage tone="ok">Saved.</FormMessage> : null}
        {update.error && !(update.error instanceof ApiError && update.error.fields.length) ? (
          <FormMessage tone="error">{update.error.message}</FormMessage>
        ) : null}
        <Button type="submit" disabled={isSubmitting} className="self-start">
          {isSubmitting ? 'Saving…' : 'Save'}
        </Button>
      </form>
    </section>
  );
}

function PasswordSection() {
  const [result, setResult] = useState<{ tone: 'ok' | 'error'; text: string } | null>(null);
  const form = useForm<
    z.input<typeof changePasswordForm>,
    unknown,
    z.output<typeof changePasswordForm>
  >({
    resolver: zodResolver(changePasswordForm),
    defaultValues: { currentPassword: '', newPassword: '', confirm: '', revokeOtherSessions: true },
  });
  const { errors, isSubmitting } = form.formState;
  const onSubmit = form.handleSubmit(
    async ({ currentPassword, newPassword, revokeOtherSessions }) => {
      setResult(null);
      const { error } = await authClient.changePassword({
        currentPassword,
        newPassword,
        revokeOtherSessions,
      });
      if (error) {
        setResult({ tone: 'error', text: authErrorMessage(error)! });
        return;
      }
      form.reset();
      setResult({
        tone: 'ok',
        text: revokeOtherSessions
          ? 'Password changed. Your other devices were signed out.'
          : 'Password changed.',
      });
    },
  );
  return (
    <section
      aria-labelledby="password-heading"
      className="rounded-xl bg-white p-4 shadow-sm sm:p-6"
    >
      <h2 id="password-heading" className="text-xl font-semibold text-leaf-900">
        Password
      </h2>
      <form onSubmit={onSubmit} noValidate className="mt-3 flex flex-col gap-4">
        <PasswordField
          label="Current password"
          error={errors.currentPassword?.message}
          {...form.register('currentPassword')}
        />
        <NewPasswordField error={errors.newPassword?.message} {...form.register('newPassword')} />
        <ConfirmPasswordField error={errors.confirm?.message} {...form.register('confirm')} />
        <label className="flex min-h-11 items-center gap-3">
          <input
            type="checkbox"
            className="h-5 w-5 accent-leaf-700"
            {...form.register('revokeOtherSessions')}
          />
          Sign out my other devices
        </label>
        {result ? <FormMessage tone={result.tone}>{result.text}</FormMessage> : null}
        <Button type="submit" disabled={isSubmitting} className="self-start">
          {isSubmitting ? 'Changing…' : 'Change password'}
        </Button>
      </form>
    </section>
  );
}

export function Component() {
  const { data: me, isPending } = useMe();
  if (isPending || !me) return <Spinner label="Loading your account…" />;
  return (
    <div className="mx-auto flex max-w-2xl flex-col gap-4">
      <header>
        <h1 className="text-3xl font-semibold text-leaf-900">Your account</h1>
        <p className="mt-1 text-loam-700">
          {me.email}
          {me.isAdmin ? ' · administrator of this Rowtally' : ''}
        </p>
      </header>
      <ProfileSection me={me} />
      <PasswordSection />
    </div>
  );
}
