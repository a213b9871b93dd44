import type { InputHTMLAttributes, ReactNode, SelectHTMLAttributes } from 'react';
import { useId } from 'react';
import { ApiError } from '@/lib/api-client';

const inputClass =
  'mt-1 block min-h-11 w-full rounded-lg border border-leaf-300 bg-white px-3 text-ink aria-[invalid=true]:border-frost-600';

/** Per-field messages from a failed request: `body.code` → `code`, `body.plots.1.gaps` → `plots.1.gaps`. */
export const fieldErrors = (error: unknown): Record<string, string> =>
  error instanceof ApiError ? error.fieldMessages : {};

function Described({
  id,
  label,
  hint,
  error,
  children,
  className = '',
}: {
  id: string;
  label: ReactNode;
  hint?: ReactNode;
  error?: string;
  children: ReactNode;
  className?: string;
}) {
  return (
    <div className={className}>
      <label htmlFor={id} className="block text-sm font-medium text-leaf-900">
        {label}
      </label>
      {children}
      {hint ? (
        <p id={`${id}-hint`} className="mt-1 text-xs text-loam-700">
          {hint}
        </p>
      ) : null}
      {error ? (
        <p id={`${id}-error`} className="mt-1 text-sm text-frost-600">
          {error}
        </p>
      ) : null}
    </div>
  );
}

type FieldProps = {
  label: ReactNode;
  hint?: ReactNode;
  error?: string;
  /** Shown after the input, e.g. the unit. */
  suffix?: string;
  className?: string;
};

export function TextField({
  label,
  hint,
  error,
  suffix,
  className,
  ...input
}: FieldProps & InputHTMLAttributes<HTMLInputElement>) {
  const id = useId();
  const describedBy =
    [hint ? `${id}-hint` : '', error ? `${id}-error` : ''].filter(Boolean).join(' ') || undefined;
  return (
    <Described id={id} label={label} hint={hint} error={error} className={className}>
      <div className="flex items-center gap-2">
        <input
          id={id}
          aria-invalid={error ? true : undefined}
          aria-describedby={describedBy}
          className={inputClass}
          {...input}
        />
        {suffix ? <span className="mt-1 text-sm text-loam-700">{suffix}</span> : null}
      </div>
    </Described>
  );
}

export function TextArea({
  label,
  hint,
  error,
  className,
  ...input
}: FieldProps & React.TextareaHTMLAttributes<HTMLTextAreaElement>) {
  const id = useId();
  return (
    <Described id={id} label={label} hint={hint} error={error} className={className}>
      <textarea
        id={id}
        aria-invalid={error ? true : undefined}
        aria-describedby={error ? `${id}-error` : hint ? `${id}-hint` : undefined}
        className={`${inputClass} py-2`}
        rows={3}
        {...input}
      />
    </Described>
  );
}

export function SelectField({
  label,
  hint,
  error,
  className,
  options,
  ...select
}: FieldProps &
  SelectHTMLAttributes<HTMLSelectElement> & { options: readonly (readonly [string, string])[] }) {
  const id = useId();
  return (
    <Described id={id} label={label} hint={hint} error={error} className={className}>
      <select
        id={id}
        aria-invalid={error ? true : undefined}
        aria-describedby={error ? `${id}-error` : hint ? `${id}-hint` : undefined}
        className={inputClass}
        {...select}
      >
        {options.map(([value, text]) => (
          <option key={value} value={value}>
            {text}
          </option>
        ))}
      </select>
    </Described>
  );
}

export function FormError({ error }: { error: unknown }) {
  if (!error) return null;
  const message = error instanceof Error ? error.message : 'Something went wrong.';
  return (
    <p role="alert" className="rounded-lg border border-frost-600/40 bg-white p-3 text-frost-600">
      {message}
    </p>
  );
}

/** A number typed in a form, or null when left blank. */
export function numberOrNull(value: FormDataEntryValue | null): number | null {
  if (value === null || String(value).trim() === '') return null;
  const n = Number(String(value).replace(',', '.'));
  return Number.isFinite(n) ? n : Number.NaN;
}
