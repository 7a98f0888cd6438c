// Fresh records for one test, made through the models (the functions the routes call) in the demo
// shop, so a browser test needs nothing another test left behind and can run alone, in any order.
// The demo seed itself is only read. Every model import of the browser tests lives here.
import { DEMO_SHOP, DEMO_USERS, OTHER_SHOP } from "../../db/demo";
import { stableId } from "../../db/seed";
import type { Tree } from "../../app/engine/types";
import type { Ctx } from "../../app/lib/context";
import { createCall } from "../../app/models/calls.server";
import { invite } from "../../app/models/people.server";
import { reportMailHtml } from "../../app/components/report/reportMail";
import { reportNumber } from "../../app/lib/report-data";
import { recordOutcome } from "../../app/models/runs/lifecycle.server";
import { addPhoto } from "../../app/models/runs/photos.server";
import { sendReport } from "../../app/models/runs/reports.server";
import { startRun } from "../../app/models/runs/start.server";
import { getRunView } from "../../app/models/runs/view.server";
import { foundHereBefore } from "../../app/models/insights/found-here.server";
import { postStep, type StepInput } from "../../app/models/runs/steps.server";
import { createPublishedTree, replaceDraftContent, startDraft } from "../../app/models/trees/drafts.server";
import { addTreeImage } from "../../app/models/trees/images.server";
import { TINY_PNG } from "./photo";
import { smallTree } from "./trees";

/** The caller's context of a demo user, as the session would give it. */
export function ctxOf(email: string): Ctx {
  const u = DEMO_USERS.find((d) => d.email === email);
  if (!u) throw new Error(`no demo user ${email}`);
  return { shopId: stableId(u.shop === "demo" ? DEMO_SHOP.key : OTHER_SHOP.key), userId: stableId(`user:${email}`), role: u.role };
}

const lead = ctxOf("lead@tinderbox.example");
const tech = ctxOf("tech@tinderbox.example");
const owner = ctxOf("owner@tinderbox.example");

export const DEMO_UNITS = {
  rotisserie: stableId("unit:larkspur-rotisserie"),
  griddle: stableId("unit:gilded-griddle"),
  fryer: stableId("unit:hollin-fryer"),
} as const;

/** A short random tag that keeps one test's records apart from every other's. */
export const tag = () => crypto.randomUUID().slice(0, 6);

/** A new open call on a demo unit, assigned to the demo technician. */
export async function freshCall(unit: keyof typeof DEMO_UNITS, symptom: string): Promise<{ id: string; number: number }> {
  return createCall(lead, { unitId: DEMO_UNITS[unit], symptom, priority: "high", assignedTo: tech.userId, notes: null });
}

/**
 * The four-node capacitor tree (tests/support/trees.ts) published as version 1 under `title`.
 * With `draft`, an open draft follows it: a copy of version 1, or what `draft` makes of it.
 */
export async function publishedTree(
  title: string,
  draft?: true | ((v1: Tree) => Tree),
): Promise<{ treeId: string; path: string; draftId: string | null }> {
  const v1 = smallTree(title);
  const { treeId } = await createPublishedTree(lead, v1, "Fixture: version 1");
  if (!draft) return { treeId, path: `/trees/${treeId}`, draftId: null };
  const opened = await startDraft(lead, treeId);
  // A new draft is at revision 1 (tree_versions.revision's default).
  if (draft !== true) await replaceDraftContent(lead, opened.versionId, draft(v1), 1);
  return { treeId, path: `/trees/${treeId}`, draftId: opened.versionId };
}

/** An image for a tree's step bodies (the 1×1 test PNG). */
export async function treeImage(treeId: string): Promise<string> {
  return (await addTreeImage(lead, treeId, TINY_PNG, "terminal block.png")).id;
}

/** An open invitation from the demo shop's owner; the token is the secret of the invite link. */
export async function pendingInvitation(email: string): Promise<{ id: string; token: string }> {
  return invite(owner, email, "technician");
}

const ROTISSERIE_TREE = stableId("tree:rotisserie-uneven-heat.md");

/** A run started by the demo technician on a fresh rotisserie call. */
export async function startedRun(symptom = "heats unevenly"): Promise<{ callId: string; runId: string; path: string }> {
  const call = await freshCall("rotisserie", symptom);
  const started = await startRun(tech, { treeId: ROTISSERIE_TREE, callId: call.id });
  return { callId: call.id, runId: started.runId, path: `/runs/${started.runId}` };
}

/** A run as the server stores it, and what "found here before" says for its tree and unit (the runner's own sources). */
export async function storedRun(runId: string) {
  const view = (await getRunView(tech, runId))!;
  const found = await foundHereBefore(tech, { versionId: view.version.id, unitId: view.unit?.id ?? null });
  return { view, found };
}

/**
 * The rotisserie run the phone test walks, made through the models: cautions acknowledged, 208 V
 * on the van's voltmeter, one fan slow, the capacitor rated 1.5 µF, read 1.47 µF,
 * taken back and read again as 1470 nF with a photo, the shaft seized, and the outcome with two
 * parts. `partNumber` is the motor's part number (unique per call, so a test finds its own run).
 * With `send`, the report is e-mailed to the site contact.
 */
export async function finishedRun(opts: { send?: boolean; symptom?: string } = {}) {
  const { callId, runId, path } = await startedRun(opts.symptom);
  const step = async (entry: StepInput["entry"], meter?: string) => {
    await postStep(tech, runId, { key: crypto.randomUUID(), entry, meterId: meter ? stableId(meter) : null });
  };
  for (const node of ["lockout", "discharge-caps", "live-test"]) await step({ type: "acknowledge", node });
  await step({ type: "reading", node: "supply-voltage", reading: "208 V" }, "meter:van1-volts");
  await step({ type: "answer", node: "fans", answer: "one slow" });
  await step({ type: "acknowledge", node: "cap-lockout" });
  await step({ type: "nameplate", node: "cap-rating", value: "1.5 µF" });
  await step({ type: "reading", node: "cap-measure", reading: "1.47 µF" }, "meter:van1-cap");
  await step({ type: "undo" });
  await step({ type: "reading", node: "cap-measure", reading: "1470 nF" }, "meter:van1-cap");
  const photo = await addPhoto(tech, runId, { key: crypto.randomUUID(), node: "cap-measure", bytes: TINY_PNG });
  await step({ type: "answer", node: "shaft-free", answer: "stiff, gritty or seized" });
  const partNumber = `FM-208-${tag().toUpperCase()}`;
  const done = await recordOutcome(tech, runId, {
    action: "Fitted a new fan motor and run capacitor; both fans run at full speed.",
    minutes: 75,
    parts: [
      { partNumber, description: "Convection fan motor, 208 V, same frame and rotation as the original", quantity: 1 },
      { partNumber: "RC-15-370", description: "Motor-run capacitor 1.5 µF 370 V", quantity: 1 },
    ],
  });
  if (opts.send) await sendReport(tech, done.reportId, reportMailHtml);
  return {
    callId,
    runId,
    path,
    photoId: photo.photo.id,
    reportId: done.reportId,
    reportPath: `/reports/${done.reportId}`,
    reportNumber: reportNumber(done.number),
    partNumber,
  };
}
