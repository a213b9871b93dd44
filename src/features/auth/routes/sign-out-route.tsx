import { useState } from 'react';
import { Link } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { FormMessage } from '@/components/ui/text-field';
import { authClient } from '@/lib/auth-client';
import { authErrorMessage } from '@/lib/auth-error-message';
import { useMe, useSessionChanged } from '@/lib/session';
import { AuthCard } from '../components/auth-card';

export function Component() {
  const { data: me, isPending } = useMe();
  const sessionChanged = useSessionChanged();
  const [busy, setBusy] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);

  const signOut = async (everywhere: boolean) => {
    setBusy(true);
    setProblem(null);
    const { error } = everywhere ? await authClient.revokeSessions() : await authClient.signOut();
    if (error) setProblem(authErrorMessage(error));
    await sessionChanged();
    setBusy(false);
  };

  if (isPending) return null;
  if (!me) {
    return (
      <AuthCard title="You are signed out">
        <Link className="font-semibold text-leaf-700 underline" to="/sign-in">
          Sign in again
        </Link>
      </AuthCard>
    );
  }
  return (
    <AuthCard title="Sign out">
      <p>
        Signed in as <strong>{me.email}</strong>.
      </p>
      {problem ? <FormMessage tone="error">{problem}</FormMessage> : null}
      <Button onClick={() => signOut(false)} disabled={busy}>
        Sign out on this device
      </Button>
      <Button variant="secondary" onClick={() => signOut(true)} disabled={busy}>
        Sign out on every device
      </Button>
      <p className="text-sm text-loam-700">
        Use “every device” if you signed in on a shared or lost phone.
      </p>
    </AuthCard>
  );
}
