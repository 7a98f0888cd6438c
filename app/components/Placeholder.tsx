import type { ReactNode } from "react";

/** An honest "not built yet" panel: says what will be here, never shows made-up data. */
export function NotYet({ title, children }: { title: string; children: ReactNode }) {
  return (
    <section className="card border-dashed" aria-label={title}>
      <h2 className="text-lg font-bold">{title}</h2>
      <p className="mt-1 text-ink-soft">{children}</p>
      <p className="mt-2 text-sm font-semibold uppercase tracking-wide text-ink-soft">Not built yet</p>
    </section>
  );
}
