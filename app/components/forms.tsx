import { useId, type InputHTMLAttributes, type ReactNode, type SelectHTMLAttributes, type TextareaHTMLAttributes } from "react";

type Common = { label: string; name: string; error?: string; hint?: ReactNode; className?: string };

function describedBy(id: string, error?: string, hint?: ReactNode) {
  return [error ? `${id}-error` : null, hint ? `${id}-hint` : null].filter(Boolean).join(" ") || undefined;
}

/** A labelled input with its hint and error beside it (works without JavaScript). */
export function Field({ label, name, error, hint, className, ...input }: Common & InputHTMLAttributes<HTMLInputElement>) {
  const id = useId();
  return (
    <div className={className}>
      <label htmlFor={id} className="field-label">
        {label}
      </label>
      <input id={id} name={name} className="field-input" aria-invalid={error ? true : undefined} aria-describedby={describedBy(id, error, hint)} {...input} />
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

export function TextArea({ label, name, error, hint, className, ...input }: Common & TextareaHTMLAttributes<HTMLTextAreaElement>) {
  const id = useId();
  return (
    <div className={className}>
      <label htmlFor={id} className="field-label">
        {label}
      </label>
      <textarea id={id} name={name} className="field-input" aria-invalid={error ? true : undefined} aria-describedby={describedBy(id, error, hint)} {...input} />
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

export function Select({
  label,
  name,
  error,
  hint,
  className,
  options,
  ...input
}: Common & SelectHTMLAttributes<HTMLSelectElement> & { options: ReadonlyArray<{ value: string; label: string }> }) {
  const id = useId();
  return (
    <div className={className}>
      <label htmlFor={id} className="field-label">
        {label}
      </label>
      <select id={id} name={name} className="field-input" aria-invalid={error ? true : undefined} aria-describedby={describedBy(id, error, hint)} {...input}>
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
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

/** A form-level message (not tied to one field). */
export function FormError({ error }: { error?: string }) {
  if (!error) return null;
  return (
    <div role="alert" className="rounded-md border border-danger bg-danger-light px-4 py-3 text-sm font-semibold text-danger">
      {error}
    </div>
  );
}
