// On My calls: keeps today's calls, their runs and procedures on the phone (and the app itself, by
// registering the service worker), and says so in one line with a way to what is kept.
import { useEffect, useState } from "react";
import { usePhone } from "./usePhone";
import { registerWorker } from "./worker-client";

export function KeptOnPhone({ userId }: { userId: string }) {
  const { phone, snap } = usePhone(userId);
  const [fresh, setFresh] = useState(false);
  useEffect(() => {
    registerWorker();
    void phone?.refreshKit().then(() => setFresh(true));
  }, [phone]);
  const queued = snap.items.filter((i) => i.state === "queued").length;
  const refused = snap.items.some((i) => i.state !== "queued");
  const runs = Object.keys(snap.runs).length;
  if (!snap.ready || snap.storageError) return null;
  return (
    <a href="/phone" className="card flex min-h-12 items-center justify-between gap-3 text-ink no-underline hover:border-copper">
      <span>
        {refused ? (
          <span className="font-bold text-out">Some entries were not accepted by the server. </span>
        ) : queued ? (
          <span className="font-bold text-marginal">
            {queued} {queued === 1 ? "entry waits" : "entries wait"} on this phone for signal.{" "}
          </span>
        ) : null}
        {fresh ? (
          <>
            Ready for no signal: {snap.calls.length} {snap.calls.length === 1 ? "call" : "calls"}
            {runs ? ` and ${runs} ${runs === 1 ? "run" : "runs"}` : ""} kept on this phone.
          </>
        ) : (
          "Keeping today's calls on this phone for when there is no signal…"
        )}
      </span>
      <span className="shrink-0 font-semibold text-copper-dark">Open →</span>
    </a>
  );
}
