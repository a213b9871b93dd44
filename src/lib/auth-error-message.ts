/** The sign-in library's error answers in words a person can act on. */

/** The library's error answer, turned into one line a person can act on. */
export function authErrorMessage(
  error: { message?: string; code?: string; status?: number } | null,
) {
  if (!error) return null;
  switch (error.code) {
    case 'INVALID_EMAIL_OR_PASSWORD':
      return 'That e-mail address and password do not match an account.';
    case 'EMAIL_NOT_VERIFIED':
      return 'Confirm your e-mail address first: we have just sent you a new link.';
    case 'INVALID_TOKEN':
      return 'This link has expired or was already used. Ask for a new one.';
    case 'INVALID_PASSWORD':
      return 'Your current password is not right.';
    case 'SIGN_IN_DELAYED':
      // Says how long to wait for this account (the server's own wording).
      return error.message ?? 'Too many wrong passwords for this account. Wait and try again.';
  }
  if (error.status === 429) return 'Too many tries from here. Wait a minute and try again.';
  if (error.status === 0 || error.status === undefined)
    return 'No connection to Rowtally. Check the signal and try again.';
  return error.message ?? 'Something went wrong. Try again.';
}
