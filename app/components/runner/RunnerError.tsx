// The runner's error screen (the route's error boundary): says what happened in plain words and
// lists what this phone kept of the run — steps and notes not yet acknowledged by the server — so the
// technician knows nothing typed is lost; opening the run again offers to send them.
import { useEffect, useState } from "react";
import { readUnsent, type Unsent } from "~/lib/kept";

export function RunnerError({ runId, title, detail, again }: { runId: string | undefined; title: string; detail: string; again: boolean }) {
  // Read after hydration: the server never sees this phone's storage.
  const [kept, setKept] = useState<Unsent[] | null>(null);
  useEffect(() => setKept(runId ? readUnsent(runId) : []), [runId]);
  return (
    <main className="mx-auto max-w-xl space-y-4 p-5">
      <h1 className="text-2xl font-bold">{title}</h1>
      <p className="text-lg">{detail}</p>
      {kept && kept.length > 0 && (
        <section aria-labelledby="kept-here" className="space-y-2 rounded-xl border-2 border-copper bg-copper-soft p-3">
          <h2 id="kept-here" className="text-lg font-bold">
            Kept on this phone, not sent yet
          </h2>
          <ol className="list-decimal space-y-1 pl-6">
            {kept.map((u) => (
              <li key={u.key}>{u.label}</li>
            ))}
          </ol>
          <p>{again ? `Open the run again and Cluepath offers to send ${kept.length === 1 ? "it" : "them"}.` : "They stay on this phone; a lead can help if the run can't be opened."}</p>
        </section>
      )}
      {kept && kept.length === 0 && <p className="text-ink-soft">Everything you entered in this run had reached Cluepath.</p>}
      <div className="grid gap-2">
        {again && (
          <button type="button" className="btn-primary min-h-14" onClick={() => window.location.reload()}>
            Open the run again
          </button>
        )}
        <a className="btn-quiet min-h-14" href="/">
          Back to my home
        </a>
      </div>
    </main>
  );
}
