// What the runner says about the phone: what is only on it and waits for signal, what the server
// refused (with what was typed, kept until the technician decides), a sign-in that ended, and a new
// version of the app ready to load.
import { useState } from "react";
import type { RunView } from "~/lib/run-log";
import { atShop } from "~/lib/display";
import type { RunHandle } from "../useRun";
import type { OutboxItem } from "./db";
import { describeItems } from "./fold";
import { applyUpdate, useUpdateReady } from "./worker-client";

/** "3 steps and 1 photo saved on this phone — they will be sent when there is signal." */
export function waitingSentence(items: readonly OutboxItem[], until = "there is signal"): string {
  const what = describeItems(items);
  return `${what.charAt(0).toUpperCase()}${what.slice(1)} saved on this phone — ${items.length === 1 ? "it" : "they"} will be sent when ${until}.`;
}

/** The same, when the server answers but cannot store (its database is away). */
export function serverAwaySentence(items: readonly OutboxItem[]): string {
  return `Cluepath's server can't save just now. ${waitingSentence(items, "the server is back")}`;
}

export function UpdateReady() {
  const ready = useUpdateReady();
  const [busy, setBusy] = useState(false);
  if (!ready) return null;
  return (
    <div role="status" className="flex items-center justify-between gap-3 rounded-xl border-2 border-copper bg-copper-soft p-3">
      <p className="text-lg font-semibold">A new version of Cluepath is ready. What is on this phone stays.</p>
      <button
        type="button"
        className="btn-primary min-h-12 shrink-0 text-base"
        disabled={busy}
        onClick={() => {
          setBusy(true);
          void applyUpdate();
        }}
      >
        Reload
      </button>
    </div>
  );
}

/** One line per thing kept on the phone, as the technician entered it. */
export function itemText(i: OutboxItem, view: RunView): { what: string; where: string } {
  const title = (node: string | null | undefined) => view.tree.nodes.find((n) => n.id === node)?.title ?? "";
  switch (i.kind) {
    case "start":
      return { what: "Started this run", where: view.version.title };
    case "note":
      return { what: `Note: “${i.text}”`, where: title(i.node) };
    case "photo":
      return { what: "Photo", where: title(i.node) };
    case "step": {
      const e = i.entry;
      if (e.type === "undo") return { what: "Went back one step", where: "" };
      const what =
        e.type === "answer"
          ? `Answered “${e.answer}”`
          : e.type === "reading"
            ? `Reading ${e.reading}`
            : e.type === "nameplate"
              ? `Rating ${e.value}`
              : e.type === "acknowledge"
                ? "Caution acknowledged"
                : "Went on";
      return { what, where: title(e.node) };
    }
  }
}

function Refused({ run, items }: { run: RunHandle; items: OutboxItem[] }) {
  const [asking, setAsking] = useState(false);
  const { view } = run;
  const first = items.find((i) => i.state === "refused");
  return (
    <section role="alert" aria-labelledby="refused-title" className="space-y-3 rounded-xl border-2 border-out bg-out-soft p-3">
      <h2 id="refused-title" className="text-xl font-bold text-out">
        Not accepted by the server
      </h2>
      {view.viewer.holds ? (
        first?.refusal && <p className="text-lg font-semibold">“{first.refusal.message}”</p>
      ) : (
        // Taken over while the phone had no signal: say who holds the run now before the server's words.
        <>
          <p className="text-lg font-semibold">
            {view.run.technician.name} took this run over while this phone had no signal, so these were not added to it.
          </p>
          {first?.refusal && <p className="text-ink-soft">The server said: “{first.refusal.message}”</p>}
        </>
      )}
      <p>
        {view.viewer.holds
          ? "What you entered is kept on this phone until you decide:"
          : `What you entered is kept on this phone until you decide. Tell ${view.run.technician.name} what you found, or save the photos, before you remove them:`}
      </p>
      <ol className="space-y-2">
        {items.map((i) => {
          const t = itemText(i, view);
          return (
            <li key={i.n} className="rounded-lg bg-card p-2 ring-1 ring-rule">
              <p className="font-semibold">
                {t.what}
                {i.state === "held" && <span className="font-normal text-ink-soft"> — not sent, it came after the one refused</span>}
              </p>
              <p className="text-ink-soft">
                {atShop(i.at, view.timeZone, "time")}
                {t.where && ` · ${t.where}`}
              </p>
              {i.kind === "photo" && <PhotoCopy item={i} />}
            </li>
          );
        })}
      </ol>
      {asking ? (
        <div className="space-y-2">
          <p className="font-semibold">Remove these {items.length} entries from this phone? They are not on the server and will be lost.</p>
          <div className="flex gap-2">
            <button
              type="button"
              className="btn-quiet min-h-12 flex-1 border-2 border-out text-out"
              onClick={() => void run.phone.discard()}
            >
              Remove them
            </button>
            <button type="button" className="btn-quiet min-h-12 flex-1" onClick={() => setAsking(false)}>
              Keep them
            </button>
          </div>
        </div>
      ) : (
        <div className="flex gap-2">
          {/* Sending again only helps once the run is this technician's again. */}
          {view.viewer.holds && (
            <button type="button" className="btn-primary min-h-12 flex-1" onClick={() => void run.phone.retry()}>
              Send again
            </button>
          )}
          <button type="button" className="btn-quiet min-h-12 flex-1" onClick={() => setAsking(true)}>
            Remove from this phone…
          </button>
        </div>
      )}
    </section>
  );
}

function PhotoCopy({ item }: { item: OutboxItem & { kind: "photo" } }) {
  const [url] = useState(() => URL.createObjectURL(item.photo));
  return (
    <p className="mt-1 flex items-center gap-3">
      <img src={url} alt="The photo kept on this phone" className="h-16 w-16 rounded border border-rule object-cover" />
      <a href={url} download={item.fileName} className="flex min-h-12 items-center font-semibold">
        Save the photo to this phone
      </a>
    </p>
  );
}

export function PhoneStatus({ run }: { run: RunHandle }) {
  const { queued, offline, serverAway, needsSignIn, items } = run.phone;
  const refused = items.filter((i) => i.state !== "queued");
  return (
    <>
      <UpdateReady />
      {needsSignIn && (
        <p role="alert" className="rounded-xl border-2 border-marginal bg-marginal-soft p-3 text-lg font-semibold">
          Your sign-in has ended. <a href={`/login?next=${encodeURIComponent(`/runs/${run.view.run.id}`)}`}>Sign in again</a> to send what
          is on this phone; nothing is lost.
        </p>
      )}
      {offline && queued.length === 0 && refused.length === 0 && (
        <p role="status" className="rounded-xl border-2 border-marginal bg-marginal-soft px-3 py-2 font-semibold">
          No signal. This run is on this phone: what you enter is kept here and sent when there is signal.
        </p>
      )}
      {offline && queued.length > 0 && (
        <p role="status" className="rounded-xl border-2 border-marginal bg-marginal-soft px-3 py-2 font-semibold">
          No signal. {waitingSentence(queued)}
        </p>
      )}
      {!offline && serverAway && queued.length > 0 && (
        <p role="status" className="rounded-xl border-2 border-marginal bg-marginal-soft px-3 py-2 font-semibold">
          {serverAwaySentence(queued)}
        </p>
      )}
      {refused.length > 0 && <Refused run={run} items={refused} />}
    </>
  );
}
