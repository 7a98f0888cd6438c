// The runner's error screen (the route's error boundary): says what happened in plain words and
// lists what this phone holds of the run in its outbox (offline/phone.ts) — steps, notes and photos
// the server has not accepted yet — so the technician knows nothing entered is lost. They are sent
// by themselves, in order, once the run opens again and the server answers.
import { useEffect, useState } from "react";
import { describeItems } from "./offline/fold";
import { itemText } from "./offline/PhoneStatus";
import { usePhone } from "./offline/usePhone";
import { phoneUser } from "./offline/who";

export function RunnerError({ runId, title, detail, again }: { runId: string | undefined; title: string; detail: string; again: boolean }) {
  // Whose phone this is is read after hydration: the server never sees this phone's storage.
  const [userId, setUserId] = useState<string | null>(null);
  useEffect(() => setUserId(phoneUser()?.id ?? null), []);
  const { snap } = usePhone(userId);
  const ready = userId !== null && snap.ready;
  const kept = snap.items.filter((i) => i.runId === runId);
  const stored = snap.runs[runId ?? ""]?.view;
  return (
    <main className="mx-auto max-w-xl space-y-4 p-5">
      <h1 className="text-2xl font-bold">{title}</h1>
      <p className="text-lg">{detail}</p>
      {ready && kept.length > 0 && (
        <section aria-labelledby="kept-here" className="space-y-2 rounded-xl border-2 border-copper bg-copper-soft p-3">
          <h2 id="kept-here" className="text-lg font-bold">
            Kept on this phone, not sent yet
          </h2>
          {stored ? (
            <ol className="list-decimal space-y-1 pl-6">
              {kept.map((u) => {
                const t = itemText(u, stored);
                return <li key={u.n}>{t.where ? `${t.what} — ${t.where}` : t.what}</li>;
              })}
            </ol>
          ) : (
            <p>{describeItems(kept)}.</p>
          )}
          <p>
            {again
              ? `Open the run again: Cluepath sends ${kept.length === 1 ? "it" : "them"}, in order, as soon as it can.`
              : "They stay on this phone; a lead can help if the run can't be opened."}
          </p>
        </section>
      )}
      {ready && kept.length === 0 && <p className="text-ink-soft">Everything you entered in this run had reached Cluepath.</p>}
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
