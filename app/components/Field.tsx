// One labelled control: its label, an optional hint, the control itself and its error, with the
// ids wired for screen readers (aria-describedby names the hint and the error; aria-invalid marks
// an error). Field, SelectField and TextAreaField are this piece around an input, a select and a
// text area; a screen with its own control (the runner's big reading input) uses Labelled directly.
import { useId, type InputHTMLAttributes, type ReactNode } from "react";

/** The ids a control's hint and error get, for aria-describedby. */
export const describedBy = (id: string, hint?: string, error?: string) =>
  [hint && `${id}-hint`, error && `${id}-error`].filter(Boolean).join(" ") || undefined;

/** What a control inside Labelled spreads on itself. */
export type ControlProps = { id: string; "aria-invalid": true | undefined; "aria-describedby": string | undefined };

type LabelledProps = {
  label: ReactNode;
  hint?: string;
  error?: string | null;
  className?: string;
  /** Extra classes for the label (the runner's labels are larger). */
  labelClassName?: string;
  /** An id for the control; one is made when absent. */
  id?: string;
  children: (control: ControlProps) => ReactNode;
};

export function Labelled({ label, hint, error, className, labelClassName, id: given, children }: LabelledProps) {
  const made = useId();
  const id = given ?? made;
  const err = error ?? undefined;
  return (
    <div className={className}>
      <label htmlFor={id} className={`field-label ${labelClassName ?? ""}`}>
        {label}
      </label>
      {hint && (
        <p id={`${id}-hint`} className="mb-1 text-base text-ink-soft">
          {hint}
        </p>
      )}
      {children({ id, "aria-invalid": err ? true : undefined, "aria-describedby": describedBy(id, hint, err) })}
      {err && (
        <p id={`${id}-error`} className="field-error">
          {err}
        </p>
      )}
    </div>
  );
}

type Props = InputHTMLAttributes<HTMLInputElement> & { label: string; name: string; error?: string; hint?: string };

/** A labelled input with its hint and error beside it (announced to screen readers). */
export function Field({ label, name, error, hint, className, ...input }: Props) {
  return (
    <Labelled label={label} hint={hint} error={error} className={className}>
      {(control) => <input name={name} className="field-input" {...control} {...input} />}
    </Labelled>
  );
}
