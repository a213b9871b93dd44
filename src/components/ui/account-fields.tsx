import { passwordMinLength } from '@common/contracts/auth';
import type { ComponentProps } from 'react';
import { TextField } from './text-field';

/**
 * The account fields of the sign-in, sign-up, invitation and account forms, each with the
 * autocomplete that lets browsers and password managers fill it.
 */
type FieldProps = Omit<ComponentProps<typeof TextField>, 'label' | 'type' | 'autoComplete'> & {
  label?: string;
};

export function NameField({ label = 'Your name', ...props }: FieldProps) {
  return <TextField label={label} autoComplete="name" {...props} />;
}

export function EmailField({ label = 'E-mail address', ...props }: FieldProps) {
  return <TextField label={label} type="email" autoComplete="email" {...props} />;
}

/** The password of an existing account. */
export function PasswordField({ label = 'Password', ...props }: FieldProps) {
  return <TextField label={label} type="password" autoComplete="current-password" {...props} />;
}

/** A password being chosen; the hint gives the minimum length unless another is given. */
export function NewPasswordField({
  label = 'New password',
  hint = `At least ${passwordMinLength} characters.`,
  ...props
}: FieldProps) {
  return (
    <TextField label={label} type="password" autoComplete="new-password" hint={hint} {...props} />
  );
}

/** The chosen password typed a second time. */
export function ConfirmPasswordField({ label = 'New password again', ...props }: FieldProps) {
  return <TextField label={label} type="password" autoComplete="new-password" {...props} />;
}
