// The training pages' pieces: a titled section (a landmark named by its heading), the answer to a
// form (saved, or what was refused), and a table in a card that scrolls sideways on a phone.
import { useId, type ReactNode } from "react";

export function Section({ title, children }: { title: ReactNode; children: ReactNode }) {
  const id = useId();
  return (
    <section aria-labelledby={id} className="space-y-2">
      <h2 id={id} className="flex flex-wrap items-center gap-2 text-lg font-bold">
        {title}
      </h2>
      {children}
    </section>
  );
}

export function Notice({ sent }: { sent: { ok: boolean; message: string } | undefined }) {
  if (!sent) return null;
  return (
    <p
      role={sent.ok ? "status" : "alert"}
      className={`rounded-xl p-3 font-semibold ${sent.ok ? "bg-within-soft text-within" : "bg-out-soft text-out"}`}
    >
      {sent.message}
    </p>
  );
}

/** A table in a card, or the sentence that says why there is none. */
export function CardTable({
  empty,
  rows,
  minWidth = "min-w-[40rem]",
  head,
  children,
  caption,
}: {
  empty: string;
  rows: number;
  minWidth?: string;
  head: string[];
  children: ReactNode;
  caption?: ReactNode;
}) {
  if (rows === 0) return <p className="card text-ink-soft">{empty}</p>;
  return (
    // Focusable, so a keyboard can scroll a table wider than a phone (WCAG 2.1.1). Relative, so the
    // visually hidden header text (absolutely placed) scrolls with the table instead of widening the page.
    <div className="card relative overflow-x-auto p-0 focus-visible:outline-2" tabIndex={0}>
      <table className={`w-full ${minWidth}`}>
        {caption && <caption className="px-3 pt-3 text-left text-lg font-bold">{caption}</caption>}
        <thead className="border-b border-rule">
          <tr>
            {head.map((h, i) => (
              <th key={i} className="px-3 py-2 text-left text-sm font-semibold text-ink-soft">
                {h || <span className="sr-only">Action</span>}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>{children}</tbody>
      </table>
    </div>
  );
}
