// The runner opened with no run from the server: the service worker's shell (no signal), or a run
// this phone started offline that the server does not have yet. The run comes from the phone's
// storage for the user who last signed in here.
import { useEffect, useState } from "react";
import type { RunView } from "~/lib/run-log";
import { Runner } from "../Runner";
import { phoneFor } from "./phone";
import { phoneUser } from "./who";

type Found = { state: "looking" } | { state: "found"; view: RunView } | { state: "none" };

export function RunFromPhone({ runId, missing }: { runId: string; missing: boolean }) {
  const [found, setFound] = useState<Found>({ state: "looking" });
  useEffect(() => {
    const user = phoneUser();
    if (!user) return setFound({ state: "none" });
    const phone = phoneFor(user.id);
    void phone.storedRun(runId).then((r) => {
      setFound(r ? { state: "found", view: r.view } : { state: "none" });
      if (r) void phone.refreshRun(runId);
    });
  }, [runId]);

  if (found.state === "found") return <Runner key={runId} initial={found.view} fromPhone />;
  return (
    <main className="mx-auto max-w-xl space-y-4 p-6">
      {found.state === "looking" ? (
        <p role="status" className="text-lg">
          Opening the run kept on this phone…
        </p>
      ) : missing ? (
        <>
          <h1 className="text-2xl font-bold">Not found</h1>
          <p className="text-ink-soft">There is nothing at this address, or it belongs to another shop.</p>
        </>
      ) : (
        <>
          <h1 className="text-2xl font-bold">This run is not on this phone</h1>
          <p className="text-lg">
            There is no signal, and this run was not kept here. Runs you open, and the runs of your calls for today, are kept on the phone
            for next time.
          </p>
        </>
      )}
      <p className="flex flex-wrap gap-3">
        <a className="btn-primary min-h-12" href="/phone">
          What is on this phone
        </a>
        <a className="btn-quiet min-h-12" href="/">
          Back to my home
        </a>
      </p>
    </main>
  );
}
