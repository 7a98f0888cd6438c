// Labelled select and text area with their error beside them (the Field component's siblings).
import { useId, type ReactNode, type SelectHTMLAttributes, type TextareaHTMLAttributes } from "react";
import { describedBy, FieldError, Hint } from "./Field";

type Common = { label: string; name: string; error?: string; hint?: string; className?: string };

function Described({ id, hint, error }: { id: string; hint?: string; error?: string }) {
  return (
    <>
      <Hint id={id} hint={hint} />
      <FieldError id={id} error={error} />
    </>
  );
}

export function SelectField({ label, name, error, hint, className, children, ...select }: Common & SelectHTMLAttributes<HTMLSelectElement> & { children: ReactNode }) {
  const id = useId();
  return (
    <div className={className}>
      <label htmlFor={id} className="field-label">
        {label}
      </label>
      <select id={id} name={name} className="field-input" aria-invalid={error ? true : undefined} aria-describedby={describedBy(id, hint, error)} {...select}>
        {children}
      </select>
      <Described id={id} hint={hint} error={error} />
    </div>
  );
}

export function TextAreaField({ label, name, error, hint, className, ...area }: Common & TextareaHTMLAttributes<HTMLTextAreaElement>) {
  const id = useId();
  return (
    <div className={className}>
      <label htmlFor={id} className="field-label">
        {label}
      </label>
      <textarea id={id} name={name} rows={3} className="field-input py-2" aria-invalid={error ? true : undefined} aria-describedby={describedBy(id, hint, error)} {...area} />
      <Described id={id} hint={hint} error={error} />
    </div>
  );
}
