import { useState } from 'react';
import { Link, useSearchParams } from 'react-router-dom';
import { Button } from '@/components/ui/button';
import { FormMessage } from '@/components/ui/text-field';
import { authClient } from '@/lib/auth-client';
import { authErrorMessage } from '@/lib/auth-error-message';
import { AuthCard } from '../components/auth-card';

/** After sign-up: the address must be confirmed before the first sign-in. */
export function Component() {
  const [params] = useSearchParams();
  const email = params.get('email') ?? '';
  const [state, setState] = useState<{ tone: 'ok' | 'error'; text: string } | null>(null);
  const [sending, setSending] = useState(false);

  const resend = async () => {
    setSending(true);
    const { error } = await authClient.sendVerificationEmail({
      email,
      callbackURL: '/email-verified',
    });
    setSending(false);
    setState(
      error
        ? { tone: 'error', text: authErrorMessage(error)! }
        : { tone: 'ok', text: 'A new link is on its way.' },
    );
  };

  return (
    <AuthCard title="Check your e-mail">
      <p>
        We sent a link to <strong>{email || 'your address'}</strong>. Open it to confirm the
        address; you will be signed in. The link works for 24 hours.
      </p>
      <p className="text-sm text-loam-700">
        Nothing arrived? Look in the spam folder, or send the link again.
      </p>
      {state ? <FormMessage tone={state.tone}>{state.text}</FormMessage> : null}
      {email ? (
        <Button variant="secondary" onClick={resend} disabled={sending}>
          {sending ? 'Sending…' : 'Send the link again'}
        </Button>
      ) : null}
      <Link className="font-semibold text-leaf-700 underline" to="/sign-in">
        Back to sign in
      </Link>
    </AuthCard>
  );
}
