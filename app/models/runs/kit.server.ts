// What a technician's phone keeps for working without signal: their open calls, the runs in
// progress on them (as the runner shows them), and for a call with no run yet the procedures it
// would start with their published versions, so a run can begin in a basement and be created on
// the server when the phone syncs (startRun with the phone's run id).
import { eq } from "drizzle-orm";
import { users } from "../../../db/schema";
import type { Ctx } from "../../lib/context";
import { db } from "../../lib/db.server";
import type { FieldKit, KitCall, KitVersion } from "../../lib/field-kit";
import { authorize } from "../../lib/policy";
import type { RunView } from "../../lib/run-log";
import { unitView, unitWithPlace } from "../_query.server";
import { myCalls, suggestTrees } from "../calls.server";
import { listMeters } from "../meters.server";
import { shopTimeZone } from "../shop.server";
import { versionContent } from "./_version.server";
import { getRunView } from "./view.server";

export type { FieldKit };

/** At most this many procedures per call are kept for an offline start (the best matches). */
const PROCEDURES_PER_CALL = 3;

/** The caller's field kit; versions named in `have` (already on the phone) are left out. */
export async function fieldKit(ctx: Ctx, have: readonly string[] = []): Promise<FieldKit> {
  authorize(ctx, "calls.mine");
  const [calls, meterRows, timeZone, [me]] = await Promise.all([
    myCalls(ctx),
    listMeters(ctx),
    shopTimeZone(ctx),
    db().select({ id: users.id, name: users.name }).from(users).where(eq(users.id, ctx.userId)).limit(1),
  ]);
  const kept = new Set(have);
  const versions: Record<string, KitVersion> = {};
  const out: KitCall[] = [];
  const runs: RunView[] = [];
  for (const c of calls) {
    const place = await unitWithPlace(ctx, c.unitId);
    if (!place) continue;
    // The procedures the call page would offer for this unit (its category, no kind against it).
    const procedures = (await suggestTrees(ctx, { category: c.category, make: c.make, model: c.model }, c.symptom))
      .filter((t) => t.fits)
      .slice(0, PROCEDURES_PER_CALL)
      .map((t) => ({ treeId: t.treeId, versionId: t.versionId, title: t.title, number: t.number, symptom: t.symptom }));
    for (const p of procedures) {
      if (kept.has(p.versionId) || versions[p.versionId]) continue;
      const v = await versionContent(ctx, p.versionId);
      versions[p.versionId] = {
        id: v.versionId,
        treeId: v.treeId,
        number: v.number,
        title: v.title,
        tree: v.tree,
        bodies: v.bodies,
        description: v.description,
      };
    }
    if (c.openRun) {
      const view = await getRunView(ctx, c.openRun.id);
      if (view.viewer.holds) runs.push(view);
    }
    out.push({
      id: c.id,
      number: c.number,
      symptom: c.symptom,
      priority: c.priority,
      status: c.status,
      customerName: c.customerName,
      siteName: c.siteName,
      siteAddress: c.siteAddress,
      make: c.make,
      model: c.model,
      unit: unitView(place),
      openRun: c.openRun ? { id: c.openRun.id, status: c.openRun.status } : null,
      procedures,
    });
  }
  return {
    user: { id: ctx.userId, name: me?.name ?? "" },
    timeZone,
    meters: meterRows.map(({ retired: _retired, ...m }) => m),
    calls: out,
    runs,
    versions,
  };
}
