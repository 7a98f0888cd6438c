// /phone — what this phone keeps for working without signal: runs in progress, today's calls with
// the procedures to start one here, and what waits to be sent or was refused. With no signal the
// service worker opens this page for any address it cannot reach.
import { useEffect, useState } from "react";
import { atShop, placeName } from "~/lib/display";
import { stepsDone } from "~/lib/run-log";
import type { StoredRun } from "./db";
import { serverAwaySentence, UpdateReady, waitingSentence } from "./PhoneStatus";
import type { Phone, PhoneSnapshot } from "./phone";
import { useBrowserOnline, usePhone } from "./usePhone";
import { phoneUser, setPhoneUser } from "./who";
import { registerWorker } from "./worker-client";

type SignedIn = { id: string; name: string; role: string } | null;

function RunCard({ r, snap }: { r: StoredRun; snap: PhoneSnapshot }) {
  const v = r.view;
  const mine = snap.items.filter((i) => i.runId === r.id);
  const refused = mine.some((i) => i.state !== "queued");
  // The runner's count ("5 done"): the server's steps less those taken back, then each step waiting
  // on the phone adds one and each undo waiting takes one back.
  const waiting = mine.filter((i) => i.kind === "step" && i.state === "queued");
  const done = stepsDone(v.steps) + waiting.reduce((n, i) => n + (i.kind === "step" && i.entry.type === "undo" ? -1 : 1), 0);
  return (
    <li>
      <a
        href={`/runs/${r.id}`}
        className="card block text-ink no-underline hover:border-copper"
        aria-label={`Open the run: ${v.version.title}${v.call ? `, call ${v.call.number}` : ""}`}
      >
        <p className="text-lg font-bold">
          {v.call ? `Call ${v.call.number} · ` : ""}
          {v.version.title}
        </p>
        {v.unit && (
          <p className="text-ink-soft">
            {v.unit.make} {v.unit.model} · {v.unit.customer}
          </p>
        )}
        <p className="text-ink-soft">
          {done === 0 ? "Not begun" : `${done} ${done === 1 ? "step" : "steps"} done`}
          {r.local ? " · started on this phone" : ""}
          {v.run.status === "paused" ? " · paused" : ""}
        </p>
        {refused && <p className="font-bold text-out">Some entries were not accepted — open the run to decide.</p>}
        <p className="mt-2 font-semibold text-copper-dark">Open the run →</p>
      </a>
    </li>
  );
}

function CallCard({ c, phone, running }: { c: PhoneSnapshot["calls"][number]; phone: Phone; running: boolean }) {
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  return (
    <li className="card space-y-2">
      <p className="text-lg font-bold">Call {c.number}</p>
      <p className="text-xl font-semibold">“{c.symptom}”</p>
      <p className="text-ink-soft">
        {c.make} {c.model} · {placeName(c.customerName, c.siteName)}
      </p>
      {c.openRun ? (
        <a className="btn-primary min-h-14 w-full" href={`/runs/${c.openRun.id}`}>
          Open the run →
        </a>
      ) : running ? null : c.procedures.length === 0 ? (
        <p>No published procedure for this kind of equipment is kept on this phone.</p>
      ) : (
        c.procedures.map((p, i) => (
          <button
            key={p.versionId}
            type="button"
            className={`${i === 0 ? "btn-primary" : "btn-quiet"} min-h-14 w-full`}
            disabled={busy}
            aria-label={`Start: ${p.title}`}
            onClick={() => {
              setBusy(true);
              phone.startHere(c, p.versionId).then(
                (runId) => window.location.assign(`/runs/${runId}`),
                (e: unknown) => {
                  setBusy(false);
                  setError(e instanceof Error ? e.message : "The run could not be started.");
                },
              );
            }}
          >
            Start: {p.title} (v{p.number})
          </button>
        ))
      )}
      {error && (
        <p role="alert" className="field-error">
          {error}
        </p>
      )}
    </li>
  );
}

export function OnPhone({ signedIn }: { signedIn: SignedIn }) {
  // Online the server says who is signed in; from the shell (no signal) the phone remembers.
  const [user, setUser] = useState(signedIn);
  useEffect(() => {
    registerWorker();
    if (signedIn) setPhoneUser({ id: signedIn.id, name: signedIn.name });
    else setUser((u) => u ?? (phoneUser() ? { ...phoneUser()!, role: "technician" } : null));
  }, [signedIn]);
  const { phone, snap } = usePhone(user?.id ?? null);
  const online = useBrowserOnline() && snap.online;
  useEffect(() => {
    if (phone && signedIn?.role === "technician") void phone.refreshKit();
  }, [phone, signedIn]);

  const runs = Object.values(snap.runs)
    .filter((r) => r.view.run.status === "active" || r.view.run.status === "paused" || snap.items.some((i) => i.runId === r.id))
    .sort((a, b) => (b.openedAt ?? "").localeCompare(a.openedAt ?? ""));
  const runningCalls = new Set(runs.map((r) => r.view.call?.id).filter(Boolean));
  const queued = snap.items.filter((i) => i.state === "queued");
  const calls = snap.calls.filter((c) => !runs.some((r) => r.id === c.openRun?.id));

  return (
    <div className="min-h-dvh bg-paper">
      <header className="sticky top-0 z-10 border-b border-rule bg-card">
        <div className="mx-auto flex max-w-xl items-center justify-between gap-2 px-3 py-1">
          <a href="/" className="flex min-h-12 items-center text-base font-semibold">
            ← My home
          </a>
          <span
            role="status"
            className={`rounded-full px-3 py-1 text-base font-bold ${online ? "bg-within-soft text-within" : "bg-marginal-soft text-marginal"}`}
          >
            {online ? "Signal" : "No signal"}
          </span>
        </div>
      </header>
      <main className="mx-auto max-w-xl space-y-5 px-4 py-5">
        <div>
          <h1 className="text-2xl font-bold">On this phone</h1>
          {user ? (
            <p className="text-ink-soft">
              Kept for {user.name} to work without signal
              {snap.kit ? ` · calls as of ${atShop(snap.kit.savedAt, snap.kit.timeZone, "time")}` : ""}.
            </p>
          ) : (
            <p className="text-lg">
              Nothing is kept on this phone. Sign in when there is signal: your calls and the runs you open are then kept here for working
              without it.
            </p>
          )}
        </div>
        <UpdateReady />
        {snap.storageError && (
          <p role="alert" className="field-error">
            This browser does not let Cluepath keep anything on the phone ({snap.storageError}).
          </p>
        )}
        {queued.length > 0 && (
          <p role="status" className="rounded-xl border-2 border-marginal bg-marginal-soft p-3 text-lg font-semibold">
            {!online ? waitingSentence(queued) : snap.serverAway ? serverAwaySentence(queued) : `Sending what is on this phone…`}
          </p>
        )}
        {user && (
          <>
            <section aria-labelledby="runs-here" className="space-y-3">
              <h2 id="runs-here" className="text-xl font-bold">
                Runs in progress
              </h2>
              {runs.length === 0 ? (
                <p className="text-ink-soft">None kept here.</p>
              ) : (
                <ul className="space-y-3">
                  {runs.map((r) => (
                    <RunCard key={r.id} r={r} snap={snap} />
                  ))}
                </ul>
              )}
            </section>
            <section aria-labelledby="calls-here" className="space-y-3">
              <h2 id="calls-here" className="text-xl font-bold">
                Today's calls
              </h2>
              {!snap.ready ? (
                <p className="text-ink-soft">Reading the phone…</p>
              ) : calls.length === 0 ? (
                <p className="text-ink-soft">No other call is kept here.</p>
              ) : (
                <ul className="space-y-3">
                  {phone && calls.map((c) => <CallCard key={c.id} c={c} phone={phone} running={runningCalls.has(c.id)} />)}
                </ul>
              )}
            </section>
          </>
        )}
      </main>
    </div>
  );
}
