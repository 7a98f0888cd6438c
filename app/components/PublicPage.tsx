// The frame of the pages used without a session (an invitation, a forgotten password): the name,
// then the page. The sign-in page has its own, with the tagline.
import type { ReactNode } from "react";

export function PublicPage({ children }: { children: ReactNode }) {
  return (
    <main className="mx-auto max-w-md px-5 py-10">
      <p className="mb-6 text-3xl font-bold tracking-tight">
        Clue<span className="text-copper">path</span>
      </p>
      {children}
    </main>
  );
}

/** A message at the top of a form: role="alert" for a refusal, role="status" for news. */
export function Notice({ kind, children }: { kind: "problem" | "done"; children: ReactNode }) {
  return kind === "problem" ? (
    <div role="alert" className="my-4 rounded-lg bg-out-soft p-3 font-semibold text-out">
      {children}
    </div>
  ) : (
    <div role="status" className="my-4 rounded-lg bg-within-soft p-3 text-within">
      {children}
    </div>
  );
}
