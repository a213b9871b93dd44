/**
 * Account forms, shared by the sign-in library's request checks on the server (server/auth/auth.ts)
 * and the client's forms. Lengths match the users table and the library's password limits.
 */
import { z } from 'zod';

export const passwordMinLength = 10;
export const passwordMaxLength = 128;

export const emailSchema = z
  .string()
  .trim()
  .toLowerCase()
  .min(1, 'Enter your e-mail address.')
  .max(254, 'Use at most 254 characters.')
  .pipe(z.email('Enter a valid e-mail address, like name@example.org.'));

export const personNameSchema = z
  .string()
  .trim()
  .min(1, 'Enter your name.')
  .max(120, 'Use at most 120 characters.');

export const passwordSchema = z
  .string()
  .min(passwordMinLength, `Use at least ${passwordMinLength} characters.`)
  .max(passwordMaxLength, `Use at most ${passwordMaxLength} characters.`);

export const signInBody = z.object({
  email: emailSchema,
  password: z.string().min(1, 'Enter your password.').max(passwordMaxLength, 'Too long.'),
});
export type SignInBody = z.infer<typeof signInBody>;

export const signUpBody = z.object({
  name: personNameSchema,
  email: emailSchema,
  password: passwordSchema,
});
export type SignUpBody = z.infer<typeof signUpBody>;

export const forgotPasswordBody = z.object({ email: emailSchema });

export const resetPasswordForm = z
  .object({ newPassword: passwordSchema, confirm: z.string() })
  .refine((v) => v.newPassword === v.confirm, {
    path: ['confirm'],
    message: 'The two passwords differ.',
  });

export const changePasswordForm = z
  .object({
    currentPassword: z.string().min(1, 'Enter your current password.'),
    newPassword: passwordSchema,
    confirm: z.string(),
    revokeOtherSessions: z.boolean(),
  })
  .refine((v) => v.newPassword === v.confirm, {
    path: ['confirm'],
    message: 'The two passwords differ.',
  });

/**
 * Only a path on this site may follow sign-in (`?next=`), so a crafted link cannot send someone
 * to another site after they sign in. The value is read the way a browser reads an address
 * (the WHATWG URL parser drops tabs and newlines and treats `\` as `/`), so "/\t/x.example"
 * cannot pass as local and then become "//x.example" on the way to the address bar.
 */
export function safeNextPath(next: string | null | undefined, fallback = '/'): string {
  if (!next || !next.startsWith('/')) return fallback;
  const base = 'http://next.invalid';
  let url: URL;
  try {
    url = new URL(next, base);
  } catch {
    return fallback;
  }
  if (url.origin !== base) return fallback;
  return url.pathname + url.search + url.hash;
}
