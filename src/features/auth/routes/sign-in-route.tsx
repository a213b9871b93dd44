import { type SignInBody, safeNextPath, signInBody } from '@common/contracts/auth';
import { zodResolver } from '@hookform/resolvers/zod';
import { useEffect, useState } from 'react';
import { useForm } from 'react-hook-form';
import { Link, useNavigate, useSearchParams } from 'react-router-dom';
import type { z } from 'zod';
import { Button } from '@/components/ui/button';
import { EmailField, PasswordField } from '@/components/ui/account-fields';
import { FormMessage } from '@/components/ui/text-field';
import { authErrorMessage } from '@/lib/auth-error-message';
import { useSessionChanged } from '@/lib/session';
import { AuthCard } from '../components/auth-card';

const loadAuthClient = () => import('@/lib/auth-client');

export function Component() {
  const [params] = useSearchParams();
  const next = safeNextPath(params.get('next'));
  const navigate = useNavigate();
  const sessionChanged = useSessionChanged();
  const [problem, setProblem] = useState<string | null>(null);
  const form = useForm<z.input<typeof signInBody>, unknown, SignInBody>({
    resolver: zodResolver(signInBody),
    defaultValues: { email: params.get('email') ?? '', password: '' },
  });
  const { errors, isSubmitting } = form.formState;
  // The sign-in library's client is fetched while the person types, not before the page shows.
  useEffect(() => void loadAuthClient(), []);

  const onSubmit = form.handleSubmit(async (values) => {
    setProblem(null);
    // No callbackURL here: the library's client would follow it instead of `next`.
    const { authClient } = await loadAuthClient();
    const { error } = await authClient.signIn.email(values);
    if (error) {
      setProblem(authErrorMessage(error));
      return;
    }
    await sessionChanged();
    navigate(next, { replace: true });
  });

  return (
    <AuthCard title="Sign in to Rowtally">
      {params.get('next') ? <p className="text-loam-700">Sign in to open that page.</p> : null}
      <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
        <EmailField error={errors.email?.message} {...form.register('email')} />
        <PasswordField error={errors.password?.message} {...form.register('password')} />
        {problem ? <FormMessage tone="error">{problem}</FormMessage> : null}
        <Button type="submit" disabled={isSubmitting}>
          {isSubmitting ? 'Signing in…' : 'Sign in'}
        </Button>
      </form>
      <p className="flex flex-wrap justify-between gap-2 text-sm">
        <Link className="font-semibold text-leaf-700 underline" to="/forgot-password">
          Forgot your password?
        </Link>
        <Link
          className="font-semibold text-leaf-700 underline"
          to={`/sign-up${params.get('next') ? `?next=${encodeURIComponent(next)}` : ''}`}
        >
          Create an account
        </Link>
      </p>
    </AuthCard>
  );
}
