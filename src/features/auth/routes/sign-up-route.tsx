import {
  passwordMinLength,
  safeNextPath,
  type SignUpBody,
  signUpBody,
} from '@common/contracts/auth';
import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { Link, useNavigate, useSearchParams } from 'react-router-dom';
import type { z } from 'zod';
import { Button } from '@/components/ui/button';
import { EmailField, NameField, NewPasswordField } from '@/components/ui/account-fields';
import { FormMessage } from '@/components/ui/text-field';
import { authClient } from '@/lib/auth-client';
import { authErrorMessage } from '@/lib/auth-error-message';
import { AuthCard } from '../components/auth-card';

export function Component() {
  const [params] = useSearchParams();
  const next = safeNextPath(params.get('next'));
  const navigate = useNavigate();
  const [problem, setProblem] = useState<string | null>(null);
  const form = useForm<z.input<typeof signUpBody>, unknown, SignUpBody>({
    resolver: zodResolver(signUpBody),
    defaultValues: { name: '', email: '', password: '' },
  });
  const { errors, isSubmitting } = form.formState;

  const onSubmit = form.handleSubmit(async (values) => {
    setProblem(null);
    const { error } = await authClient.signUp.email({
      ...values,
      callbackURL: `/email-verified?next=${encodeURIComponent(next)}`,
    });
    if (error) {
      // The server's own field checks (same schema) name the field.
      const fields = (error as { fields?: { path: string; message: string }[] }).fields;
      if (fields?.length) {
        for (const f of fields) form.setError(f.path as keyof SignUpBody, { message: f.message });
        return;
      }
      setProblem(authErrorMessage(error));
      return;
    }
    navigate(`/check-email?email=${encodeURIComponent(values.email)}`);
  });

  return (
    <AuthCard title="Create your Rowtally account">
      <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
        <NameField error={errors.name?.message} {...form.register('name')} />
        <EmailField error={errors.email?.message} {...form.register('email')} />
        <NewPasswordField
          label="Password"
          hint={`At least ${passwordMinLength} characters. A few unrelated words are easy to remember.`}
          error={errors.password?.message}
          {...form.register('password')}
        />
        {problem ? <FormMessage tone="error">{problem}</FormMessage> : null}
        <Button type="submit" disabled={isSubmitting}>
          {isSubmitting ? 'Creating your account…' : 'Create account'}
        </Button>
      </form>
      <p className="text-sm">
        Already have an account?{' '}
        <Link className="font-semibold text-leaf-700 underline" to="/sign-in">
          Sign in
        </Link>
      </p>
    </AuthCard>
  );
}
