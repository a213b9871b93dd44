import {
  type InputHTMLAttributes,
  type ReactNode,
  type Ref,
  type SelectHTMLAttributes,
  type TextareaHTMLAttributes,
  useId,
} from 'react';

/**
 * The labelled controls of every form: a label, a hint above the control and the error below
 * it, both tied to the control for screen readers. They take react-hook-form's `register()`
 * straight (name, ref, onChange, onBlur).
 */
type FieldProps = {
  label: ReactNode;
  error?: string | undefined;
  hint?: ReactNode;
  className?: string;
};

const controlClass = (error: unknown) =>
  `min-h-11 w-full rounded-lg border bg-white px-3 text-ink ${error ? 'border-frost-600' : 'border-leaf-300'}`;

function Field({
  id,
  label,
  error,
  hint,
  className = '',
  children,
}: FieldProps & { id: string; children: ReactNode }) {
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
      {children}
      {error ? (
        <p id={`${id}-error`} className="text-sm font-medium text-frost-600">
          {error}
        </p>
      ) : null}
    </div>
  );
}

/** aria attributes that tie a control to its hint and error. */
function described(id: string, { error, hint }: { error?: unknown; hint?: unknown }) {
  const describedBy = [hint ? `${id}-hint` : null, error ? `${id}-error` : null]
    .filter(Boolean)
    .join(' ');
  return {
    id,
    'aria-invalid': error ? true : undefined,
    'aria-describedby': describedBy || undefined,
  };
}

/** A labelled input; `suffix` is the unit shown after it. */
export function TextField({
  label,
  error,
  hint,
  suffix,
  ref,
  className,
  ...props
}: InputHTMLAttributes<HTMLInputElement> &
  FieldProps & { suffix?: string; ref?: Ref<HTMLInputElement> }) {
  const id = useId();
  const input = (
    <input
      ref={ref}
      {...described(id, { error, hint })}
      className={controlClass(error)}
      {...props}
    />
  );
  return (
    <Field id={id} label={label} error={error} hint={hint} className={className}>
      {suffix ? (
        <div className="flex items-center gap-2">
          {input}
          <span className="text-sm text-loam-700">{suffix}</span>
        </div>
      ) : (
        input
      )}
    </Field>
  );
}

export function TextArea({
  label,
  error,
  hint,
  ref,
  className,
  ...props
}: TextareaHTMLAttributes<HTMLTextAreaElement> & FieldProps & { ref?: Ref<HTMLTextAreaElement> }) {
  const id = useId();
  return (
    <Field id={id} label={label} error={error} hint={hint} className={className}>
      <textarea
        ref={ref}
        rows={3}
        {...described(id, { error, hint })}
        className={`${controlClass(error)} py-2`}
        {...props}
      />
    </Field>
  );
}

/** A labelled select; `options` are [value, text] pairs. */
export function SelectField({
  label,
  error,
  hint,
  ref,
  className,
  options,
  ...props
}: SelectHTMLAttributes<HTMLSelectElement> &
  FieldProps & {
    options: readonly (readonly [string, string])[];
    ref?: Ref<HTMLSelectElement>;
  }) {
  const id = useId();
  return (
    <Field id={id} label={label} error={error} hint={hint} className={className}>
      <select
        ref={ref}
        {...described(id, { error, hint })}
        className={controlClass(error)}
        {...props}
      >
        {options.map(([value, text]) => (
          <option key={value} value={value}>
            {text}
          </option>
        ))}
      </select>
    </Field>
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
