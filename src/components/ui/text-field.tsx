import { type InputHTMLAttributes, type Ref, useId } from 'react';

/** A labelled input with its hint and error tied to it for screen readers. */
export function TextField({
  label,
  error,
  hint,
  ref,
  className = '',
  ...props
}: InputHTMLAttributes<HTMLInputElement> & {
  label: string;
  error?: string;
  hint?: string;
  ref?: Ref<HTMLInputElement>;
}) {
  const id = useId();
  const describedBy = [hint ? `${id}-hint` : null, error ? `${id}-error` : null]
    .filter(Boolean)
    .join(' ');
  return (
    <div className={`flex flex-col gap-1 ${className}`}>
      <label htmlFor={id} className="font-medium text-ink">
        {label}
      </label>
      {hint ? (
        <p id={`${id}-hint`} className="text-sm text-loam-700">
          {hint}
        </p>
      ) : null}
      <input
        id={id}
        ref={ref}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy || undefined}
        className={`min-h-11 rounded-lg border bg-white px-3 text-ink ${error ? 'border-frost-600' : 'border-leaf-300'}`}
        {...props}
      />
      {error ? (
        <p id={`${id}-error`} className="text-sm font-medium text-frost-600">
          {error}
        </p>
      ) : null}
    </div>
  );
}

/** A message above or below a form: an error (role=alert) or a confirmation (role=status). */
export function FormMessage({
  tone,
  children,
}: {
  tone: 'error' | 'ok';
  children: React.ReactNode;
}) {
  return tone === 'error' ? (
    <p role="alert" className="rounded-lg border border-frost-600/40 bg-white p-3 text-frost-600">
      {children}
    </p>
  ) : (
    <p role="status" className="rounded-lg border border-leaf-300 bg-leaf-50 p-3 text-leaf-900">
      {children}
    </p>
  );
}
