import { forgotPasswordBody } from '@common/contracts/auth';
import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { Link } from 'react-router-dom';
import type { z } from 'zod';
import { Button } from '@/components/ui/button';
import { EmailField } from '@/components/ui/account-fields';
import { FormMessage } from '@/components/ui/text-field';
import { authClient } from '@/lib/auth-client';
import { authErrorMessage } from '@/lib/auth-error-message';
import { AuthCard } from '../components/auth-card';

export function Component() {
  const [sentTo, setSentTo] = useState<string | null>(null);
  const [problem, setProblem] = useState<string | null>(null);
  const form = useForm<
    z.input<typeof forgotPasswordBody>,
    unknown,
    z.output<typeof forgotPasswordBody>
  >({
    resolver: zodResolver(forgotPasswordBody),
    defaultValues: { email: '' },
  });
  const { errors, isSubmitting } = form.formState;
  const onSubmit = form.handleSubmit(async ({ email }) => {
    setProblem(null);
    const { error } = await authClient.requestPasswordReset({
      email,
      redirectTo: '/reset-password',
    });
    if (error) setProblem(authErrorMessage(error));
    else setSentTo(email);
  });

  return (
    <AuthCard title="Forgot your password?">
      {sentTo ? (
        <FormMessage tone="ok">
          If an account uses {sentTo}, a link to choose a new password is on its way. It works for
          one hour.
        </FormMessage>
      ) : (
        <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
          <p>Enter your address and we will send you a link to choose a new password.</p>
          <EmailField error={errors.email?.message} {...form.register('email')} />
          {problem ? <FormMessage tone="error">{problem}</FormMessage> : null}
          <Button type="submit" disabled={isSubmitting}>
            {isSubmitting ? 'Sending…' : 'Send the link'}
          </Button>
        </form>
      )}
      <Link className="font-semibold text-leaf-700 underline" to="/sign-in">
        Back to sign in
      </Link>
    </AuthCard>
  );
}
