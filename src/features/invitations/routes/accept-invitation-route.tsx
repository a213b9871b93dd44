import { personNameSchema, passwordSchema } from '@common/contracts/auth';
import type { InvitationPreview } from '@common/contracts/invitations';
import { roleDescriptions, roleLabels } from '@common/contracts/members';
import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { useLocation, useNavigate } from 'react-router-dom';
import { z } from 'zod';
import { Button } from '@/components/ui/button';
import { ErrorPanel } from '@/components/ui/error-panel';
import { Spinner } from '@/components/ui/spinner';
import { NameField, NewPasswordField, PasswordField } from '@/components/ui/account-fields';
import { FormMessage } from '@/components/ui/text-field';
import { ApiError } from '@/lib/api-client';
import { showServerErrors } from '@/lib/form-errors';
import { authClient } from '@/lib/auth-client';
import { authErrorMessage } from '@/lib/auth-error-message';
import { useMe, useSessionChanged } from '@/lib/session';
import {
  acceptInvitation,
  useAcceptInvitation,
  useInvitationPreview,
  useSignUpWithInvitation,
} from '../api/invitation-link';

const signUpForm = z.object({ name: personNameSchema, password: passwordSchema });
const signInForm = z.object({ password: z.string().min(1, 'Enter your password.') });

function tokenFromHash(hash: string) {
  return new URLSearchParams(hash.replace(/^#/, '')).get('token') ?? '';
}

function Offer({ preview }: { preview: InvitationPreview }) {
  return (
    <div className="rounded-lg bg-leaf-50 p-3">
      <p>
        {preview.invitedBy ?? 'A trial lead'} invites{' '}
        <strong className="break-all">{preview.email}</strong> to the{' '}
        {preview.trial.crop.toLowerCase()} trial <strong>{preview.trial.title}</strong> as{' '}
        <strong>{roleLabels[preview.role].toLowerCase()}</strong>.
      </p>
      <p className="mt-1 text-sm text-loam-700">{roleDescriptions[preview.role]}</p>
      {preview.role === 'grower' && preview.siteNames.length ? (
        <p className="mt-1 text-sm">Your sites: {preview.siteNames.join(', ')}</p>
      ) : null}
    </div>
  );
}

function useJoined() {
  const navigate = useNavigate();
  const sessionChanged = useSessionChanged();
  return async (trialSlug: string) => {
    await sessionChanged();
    navigate(`/t/${trialSlug}`, { replace: true });
  };
}

function SignUpThroughLink({ token }: { token: string }) {
  const signUp = useSignUpWithInvitation();
  const joined = useJoined();
  const form = useForm<z.input<typeof signUpForm>, unknown, z.output<typeof signUpForm>>({
    resolver: zodResolver(signUpForm),
    defaultValues: { name: '', password: '' },
  });
  const { errors, isSubmitting } = form.formState;
  const onSubmit = form.handleSubmit(async (values) => {
    try {
      const res = await signUp.mutateAsync({ token, ...values });
      await joined(res.trialSlug);
    } catch (err) {
      showServerErrors(err, form.setError);
    }
  });
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      <h2 className="text-xl font-semibold text-leaf-900">Create your account and join</h2>
      <NameField error={errors.name?.message} {...form.register('name')} />
      <NewPasswordField
        label="Choose a password"
        error={errors.password?.message}
        {...form.register('password')}
      />
      {signUp.error && !(signUp.error instanceof ApiError && signUp.error.fields.length) ? (
        <FormMessage tone="error">{signUp.error.message}</FormMessage>
      ) : null}
      <Button type="submit" disabled={isSubmitting}>
        {isSubmitting ? 'Joining…' : 'Create account and join'}
      </Button>
    </form>
  );
}

function SignInThroughLink({ token, email }: { token: string; email: string }) {
  const joined = useJoined();
  const [problem, setProblem] = useState<string | null>(null);
  const form = useForm<z.input<typeof signInForm>, unknown, z.output<typeof signInForm>>({
    resolver: zodResolver(signInForm),
    defaultValues: { password: '' },
  });
  const { errors, isSubmitting } = form.formState;
  const onSubmit = form.handleSubmit(async ({ password }) => {
    setProblem(null);
    const { error } = await authClient.signIn.email({ email, password });
    if (error) {
      setProblem(authErrorMessage(error));
      return;
    }
    try {
      await joined((await acceptInvitation(token)).trialSlug);
    } catch (err) {
      setProblem(err instanceof Error ? err.message : 'Could not join.');
    }
  });
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      <h2 className="text-xl font-semibold text-leaf-900">Sign in to join</h2>
      <p>
        An account already uses <strong className="break-all">{email}</strong>.
      </p>
      <PasswordField error={errors.password?.message} {...form.register('password')} />
      {problem ? <FormMessage tone="error">{problem}</FormMessage> : null}
      <Button type="submit" disabled={isSubmitting}>
        {isSubmitting ? 'Joining…' : 'Sign in and join'}
      </Button>
    </form>
  );
}

function SignedInAccept({
  token,
  preview,
  myEmail,
}: {
  token: string;
  preview: InvitationPreview;
  myEmail: string;
}) {
  const accept = useAcceptInvitation();
  const joined = useJoined();
  const sessionChanged = useSessionChanged();
  if (myEmail.toLowerCase() !== preview.email) {
    return (
      <div className="flex flex-col gap-3">
        <FormMessage tone="error">
          You are signed in as {myEmail}, but this invitation is for {preview.email}. Sign out, then
          open the link again.
        </FormMessage>
        <Button
          variant="secondary"
          onClick={async () => {
            await authClient.signOut();
            await sessionChanged();
          }}
        >
          Sign out
        </Button>
      </div>
    );
  }
  return (
    <div className="flex flex-col gap-3">
      {accept.error ? <FormMessage tone="error">{accept.error.message}</FormMessage> : null}
      <Button
        disabled={accept.isPending}
        onClick={async () => joined((await accept.mutateAsync(token)).trialSlug)}
      >
        {accept.isPending ? 'Joining…' : `Join “${preview.trial.title}”`}
      </Button>
    </div>
  );
}

const closedMessages: Record<Exclude<InvitationPreview['state'], 'pending'>, string> = {
  accepted: 'This invitation has already been used. Sign in to reach the trial.',
  revoked: 'The trial lead withdrew this invitation.',
  expired:
    'This invitation has expired (links work for 7 days). Ask the trial lead to send it again.',
};

export function Component() {
  const { hash } = useLocation();
  const token = tokenFromHash(hash);
  const { data: preview, error, isPending } = useInvitationPreview(token);
  const { data: me, isPending: mePending } = useMe();

  let body;
  if (!token)
    body = (
      <FormMessage tone="error">
        This invitation link is incomplete; open it again from the e-mail.
      </FormMessage>
    );
  else if (isPending || mePending) body = <Spinner label="Reading the invitation…" />;
  else if (error) body = <ErrorPanel error={error} title="This invitation cannot be used" />;
  else if (preview.state !== 'pending')
    body = (
      <>
        <Offer preview={preview} />
        <FormMessage tone="error">{closedMessages[preview.state]}</FormMessage>
      </>
    );
  else
    body = (
      <>
        <Offer preview={preview} />
        {me ? (
          <SignedInAccept token={token} preview={preview} myEmail={me.email} />
        ) : preview.accountExists ? (
          <SignInThroughLink token={token} email={preview.email} />
        ) : (
          <SignUpThroughLink token={token} />
        )}
      </>
    );

  return (
    <section className="mx-auto flex w-full max-w-md flex-col gap-4 rounded-xl bg-white p-4 shadow-sm sm:p-6">
      <h1 className="text-2xl font-semibold text-leaf-900">Invitation to a trial</h1>
      {body}
    </section>
  );
}
