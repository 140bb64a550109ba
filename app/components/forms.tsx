import { useId, type InputHTMLAttributes, type ReactNode, type SelectHTMLAttributes, type TextareaHTMLAttributes } from "react";

type Common = { label: string; name: string; error?: string; hint?: ReactNode; className?: string };

function describedBy(id: string, error?: string, hint?: ReactNode) {
  return [error ? `${id}-error` : null, hint ? `${id}-hint` : null].filter(Boolean).join(" ") || undefined;
}

/** Label, hint and error around one control; the control gets its id and aria attributes. */
function FieldShell({
  label,
  error,
  hint,
  className,
  children,
}: Omit<Common, "name"> & { children: (a11y: { id: string; "aria-invalid"?: true; "aria-describedby"?: string }) => ReactNode }) {
  const id = useId();
  return (
    <div className={className}>
      <label htmlFor={id} className="field-label">
        {label}
      </label>
      {children({ id, "aria-invalid": error ? true : undefined, "aria-describedby": describedBy(id, error, hint) })}
      {hint ? (
        <p id={`${id}-hint`} className="field-hint">
          {hint}
        </p>
      ) : null}
      {error ? (
        <p id={`${id}-error`} className="field-error" role="alert">
          {error}
        </p>
      ) : null}
    </div>
  );
}

/** A labelled input with its hint and error beside it (works without JavaScript). */
export function Field({ label, name, error, hint, className, ...input }: Common & InputHTMLAttributes<HTMLInputElement>) {
  return (
    <FieldShell label={label} error={error} hint={hint} className={className}>
      {(a11y) => <input name={name} className="field-input" {...a11y} {...input} />}
    </FieldShell>
  );
}

export function TextArea({ label, name, error, hint, className, ...input }: Common & TextareaHTMLAttributes<HTMLTextAreaElement>) {
  return (
    <FieldShell label={label} error={error} hint={hint} className={className}>
      {(a11y) => <textarea name={name} className="field-input" {...a11y} {...input} />}
    </FieldShell>
  );
}

export function Select({
  label,
  name,
  error,
  hint,
  className,
  options,
  ...input
}: Common & SelectHTMLAttributes<HTMLSelectElement> & { options: ReadonlyArray<{ value: string; label: string }> }) {
  return (
    <FieldShell label={label} error={error} hint={hint} className={className}>
      {(a11y) => (
        <select name={name} className="field-input" {...a11y} {...input}>
          {options.map((o) => (
            <option key={o.value} value={o.value}>
              {o.label}
            </option>
          ))}
        </select>
      )}
    </FieldShell>
  );
}

/** A form-level message (not tied to one field). */
export function FormError({ error }: { error?: string }) {
  if (!error) return null;
  return (
    <div role="alert" className="rounded-md border border-danger bg-danger-light px-4 py-3 text-sm font-semibold text-danger">
      {error}
    </div>
  );
}
