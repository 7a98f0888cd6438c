// Form controls for the node panel. A text field keeps what was typed; each change is checked
// (with the engine's zod schemas, through `onText`) and only a valid value reaches the draft, so
// the draft always has the shape the engine accepts and a half-typed value never gets saved.
import { useId, useState } from "react";
import { Field } from "~/components/Field";
import { SelectField as Select, TextAreaField } from "~/components/FormFields";
import { NodeSchema, TreeSchema } from "~/engine/schema";
import type { Tree, TreeNode } from "~/engine/types";

/** What the committer needs of a schema (the engine's are zod/mini). */
type Schema = {
  safeParse(value: unknown): { success: true; data: unknown } | { success: false; error: { issues: readonly { message: string }[] } };
};

/** Checks a candidate against a schema; commits it when valid, else returns the message to show. */
function committer<T>(schema: Schema, commit: (value: T) => void) {
  return (candidate: T): string | null => {
    const r = schema.safeParse(candidate);
    if (r.success) {
      commit(r.data as T);
      return null;
    }
    return sentence(r.error.issues[0]?.message ?? "This value isn't accepted.");
  };
}

export const nodeCommitter = (commit: (n: TreeNode) => void) => committer<TreeNode>(NodeSchema, commit);
export const treeCommitter = (commit: (t: Tree) => void) => committer<Tree>(TreeSchema, commit);

export function sentence(s: string): string {
  const t = s.charAt(0).toUpperCase() + s.slice(1);
  return /[.!?]$/.test(t) ? t : `${t}.`;
}

/** A typed number, or the message to show. Accepts "1.5", "-3", "2e-6"; not "", "1,5" or "abc". */
export function parseNumber(raw: string): number | { error: string } {
  const t = raw.trim();
  if (!/^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$/.test(t)) return { error: "Enter a number, like 1.5." };
  return Number(t);
}

type TextFieldProps = {
  label: string;
  initial: string;
  /** Tries the typed text; returns an error message, or null when it was taken. */
  onText: (raw: string) => string | null;
  hint?: string;
  multiline?: boolean;
  rows?: number;
  suggestions?: readonly string[];
  inputMode?: "decimal" | "text";
  className?: string;
  placeholder?: string;
  /** Shown as the current value instead of what was typed (the parent changed it). */
  value?: string;
  onRaw?: (raw: string) => void;
};

/** A text input or area that keeps what was typed and shows why a value isn't taken. */
export function TextField({
  label,
  initial,
  onText,
  hint,
  multiline,
  rows = 4,
  suggestions,
  inputMode,
  className,
  placeholder,
  value,
  onRaw,
}: TextFieldProps) {
  const listId = useId();
  const [raw, setRaw] = useState(initial);
  const [error, setError] = useState<string | null>(null);
  const common = {
    label,
    name: label,
    hint,
    className,
    placeholder,
    value: value ?? raw,
    error: error ?? undefined,
    onChange: (e: { target: { value: string } }) => {
      setRaw(e.target.value);
      onRaw?.(e.target.value);
      setError(onText(e.target.value));
    },
  };
  if (multiline) return <TextAreaField {...common} rows={rows} className={`${className ?? ""} [&_textarea]:text-base`} />;
  return (
    <>
      <Field {...common} inputMode={inputMode} list={suggestions?.length ? listId : undefined} />
      {suggestions?.length ? (
        <datalist id={listId}>
          {suggestions.map((s) => (
            <option key={s} value={s} />
          ))}
        </datalist>
      ) : null}
    </>
  );
}

type SelectFieldProps<T extends string> = {
  label: string;
  value: T;
  options: readonly { value: T; label: string; group?: string }[];
  onChange: (value: T) => void;
  hint?: string;
  className?: string;
};

/** A select over typed options (grouped when they name a group), changing the draft at once. */
export function SelectField<T extends string>({ label, value, options, onChange, hint, className }: SelectFieldProps<T>) {
  const groups = [...new Set(options.map((o) => o.group ?? ""))];
  const render = (list: typeof options) =>
    list.map((o) => (
      <option key={o.value} value={o.value}>
        {o.label}
      </option>
    ));
  return (
    <Select label={label} name={label} hint={hint} className={className} value={value} onChange={(e) => onChange(e.target.value as T)}>
      {groups.length === 1
        ? render(options)
        : groups.map((g) =>
            g ? (
              <optgroup key={g} label={g}>
                {render(options.filter((o) => o.group === g))}
              </optgroup>
            ) : (
              render(options.filter((o) => !o.group))
            ),
          )}
    </Select>
  );
}

export function Check({
  label,
  checked,
  onChange,
  hint,
}: {
  label: string;
  checked: boolean;
  onChange: (v: boolean) => void;
  hint?: string;
}) {
  const id = useId();
  return (
    <div className="flex items-start gap-3">
      <input
        id={id}
        type="checkbox"
        className="mt-1 size-6 shrink-0 accent-copper"
        checked={checked}
        onChange={(e) => onChange(e.target.checked)}
      />
      <label htmlFor={id} className="font-semibold">
        {label}
        {hint && <span className="block text-sm font-normal text-ink-soft">{hint}</span>}
      </label>
    </div>
  );
}
