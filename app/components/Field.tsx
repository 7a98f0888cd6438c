import { useId, type InputHTMLAttributes } from "react";

/** The ids a control's hint and error get, for aria-describedby. */
export const describedBy = (id: string, hint?: string, error?: string) =>
  [hint && `${id}-hint`, error && `${id}-error`].filter(Boolean).join(" ") || undefined;

export function Hint({ id, hint }: { id: string; hint?: string }) {
  if (!hint) return null;
  return (
    <p id={`${id}-hint`} className="mb-1 text-base text-ink-soft">
      {hint}
    </p>
  );
}

export function FieldError({ id, error }: { id: string; error?: string }) {
  if (!error) return null;
  return (
    <p id={`${id}-error`} className="field-error">
      {error}
    </p>
  );
}

type Props = InputHTMLAttributes<HTMLInputElement> & { label: string; name: string; error?: string; hint?: string };

/** A labelled input with its hint and error beside it (announced to screen readers). */
export function Field({ label, name, error, hint, className, ...input }: Props) {
  const id = useId();
  return (
    <div className={className}>
      <label htmlFor={id} className="field-label">
        {label}
      </label>
      <Hint id={id} hint={hint} />
      <input
        id={id}
        name={name}
        className="field-input"
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy(id, hint, error)}
        {...input}
      />
      <FieldError id={id} error={error} />
    </div>
  );
}
