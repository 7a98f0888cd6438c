// Steps and notes this phone kept because the server never acknowledged them (the screen failed, the
// page was reloaded, the server was away): offered back when the run opens, to send or to throw away.
import type { RunHandle } from "./useRun";

export function KeptSteps({ run }: { run: RunHandle }) {
  const { kept } = run;
  if (kept.length === 0) return null;
  const n = kept.length;
  return (
    <section role="alert" aria-labelledby="kept-heading" className="space-y-3 rounded-xl border-2 border-copper bg-copper-soft p-3">
      <h2 id="kept-heading" className="text-lg font-bold">
        {n === 1 ? "1 entry was not sent" : `${n} entries were not sent`}
      </h2>
      <p>{n === 1 ? "This phone kept it when the screen closed. Send it now, or throw it away." : "This phone kept them when the screen closed. Send them now, in the order you entered them, or throw them away."}</p>
      <ol className="list-decimal space-y-1 pl-6">
        {kept.map((u) => (
          <li key={u.key}>{u.label}</li>
        ))}
      </ol>
      <div className="grid gap-2 sm:grid-cols-2">
        <button type="button" className="btn-primary min-h-14" onClick={run.sendKept}>
          Send {n === 1 ? "it" : `all ${n}`}
        </button>
        <button type="button" className="btn-quiet min-h-14" onClick={run.dropKept}>
          Throw {n === 1 ? "it" : "them"} away
        </button>
      </div>
    </section>
  );
}
