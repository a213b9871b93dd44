import { safeNextPath } from '@common/contracts/auth';
import { useEffect } from 'react';
import { Link, useSearchParams } from 'react-router-dom';
import { useMe, useSessionChanged } from '@/lib/session';
import { AuthCard } from '../components/auth-card';

/** Where the confirmation link lands (the server confirmed the address and signed in). */
export function Component() {
  const [params] = useSearchParams();
  const failed = params.get('error');
  const next = safeNextPath(params.get('next'));
  const sessionChanged = useSessionChanged();
  const { data: me } = useMe();
  useEffect(() => {
    void sessionChanged();
    // Once, on arrival: the session cookie was just set by the link.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, []);

  if (failed) {
    return (
      <AuthCard title="This link no longer works">
        <p>
          The confirmation link has expired or was already used. Sign in with your password and we
          will send a fresh one.
        </p>
        <Link className="font-semibold text-leaf-700 underline" to="/sign-in">
          Sign in
        </Link>
      </AuthCard>
    );
  }
  return (
    <AuthCard title="Your address is confirmed">
      <p>{me ? `Welcome, ${me.name}. You are signed in.` : 'You can now sign in.'}</p>
      <Link className="font-semibold text-leaf-700 underline" to={me ? next : '/sign-in'}>
        {me ? 'Continue' : 'Sign in'}
      </Link>
    </AuthCard>
  );
}
