// Labelled select and text area with their hint and error (Field's siblings, the same piece).
import type { ReactNode, SelectHTMLAttributes, TextareaHTMLAttributes } from "react";
import { Labelled } from "./Field";

type Common = { label: string; name: string; error?: string; hint?: string; className?: string };

export function SelectField({
  label,
  name,
  error,
  hint,
  className,
  children,
  ...select
}: Common & SelectHTMLAttributes<HTMLSelectElement> & { children: ReactNode }) {
  return (
    <Labelled label={label} hint={hint} error={error} className={className}>
      {(control) => (
        <select name={name} className="field-input" {...control} {...select}>
          {children}
        </select>
      )}
    </Labelled>
  );
}

export function TextAreaField({ label, name, error, hint, className, ...area }: Common & TextareaHTMLAttributes<HTMLTextAreaElement>) {
  return (
    <Labelled label={label} hint={hint} error={error} className={className}>
      {(control) => <textarea name={name} rows={3} className="field-input py-2" {...control} {...area} />}
    </Labelled>
  );
}
