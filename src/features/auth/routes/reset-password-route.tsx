import { resetPasswordForm } from '@common/contracts/auth';
import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { Link, useSearchParams } from 'react-router-dom';
import type { z } from 'zod';
import { Button } from '@/components/ui/button';
import { ConfirmPasswordField, NewPasswordField } from '@/components/ui/account-fields';
import { FormMessage } from '@/components/ui/text-field';
import { authClient } from '@/lib/auth-client';
import { authErrorMessage } from '@/lib/auth-error-message';
import { AuthCard } from '../components/auth-card';

/** Where the reset link lands: ?token=… (or ?error=INVALID_TOKEN when it has expired). */
export function Component() {
  const [params] = useSearchParams();
  const token = params.get('token');
  const [done, setDone] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  const form = useForm<
    z.input<typeof resetPasswordForm>,
    unknown,
    z.output<typeof resetPasswordForm>
  >({
    resolver: zodResolver(resetPasswordForm),
    defaultValues: { newPassword: '', confirm: '' },
  });
  const { errors, isSubmitting } = form.formState;
  const onSubmit = form.handleSubmit(async ({ newPassword }) => {
    setProblem(null);
    const { error } = await authClient.resetPassword({ newPassword, token: token ?? '' });
    if (error) setProblem(authErrorMessage(error));
    else setDone(true);
  });

  if (!token || params.get('error')) {
    return (
      <AuthCard title="This link no longer works">
        <p>Reset links work once, for one hour. Ask for a new one.</p>
        <Link className="font-semibold text-leaf-700 underline" to="/forgot-password">
          Send a new link
        </Link>
      </AuthCard>
    );
  }
  if (done) {
    return (
      <AuthCard title="Password changed">
        <FormMessage tone="ok">
          Your new password is set, and every device was signed out.
        </FormMessage>
        <Link className="font-semibold text-leaf-700 underline" to="/sign-in">
          Sign in
        </Link>
      </AuthCard>
    );
  }
  return (
    <AuthCard title="Choose a new password">
      <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
        <NewPasswordField error={errors.newPassword?.message} {...form.register('newPassword')} />
        <ConfirmPasswordField error={errors.confirm?.message} {...form.register('confirm')} />
        {problem ? <FormMessage tone="error">{problem}</FormMessage> : null}
        <Button type="submit" disabled={isSubmitting}>
          {isSubmitting ? 'Saving…' : 'Set the new password'}
        </Button>
      </form>
    </AuthCard>
  );
}
