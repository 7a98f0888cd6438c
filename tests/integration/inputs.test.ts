// Inputs the API must not take as they come (issue 9 item 9): numbers that are not numbers, a photo
// on a step the run's tree doesn't have, report e-mails from roles that don't work calls or sent
// again and again, and text with a lone UTF-16 surrogate that must still replay on retry.
import { and, count, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { reports, runNotes, runPhotos, runs } from "../../db/schema";
import { closeDb, db } from "../../app/lib/db.server";
import { createCall } from "../../app/models/calls.server";
import { recordOutcome } from "../../app/models/runs/lifecycle.server";
import { REPORT_SENDING } from "../../app/models/runs/reports.server";
import { startRun } from "../../app/models/runs/start.server";
import { postStep } from "../../app/models/runs/steps.server";
import { createDraftTree } from "../../app/models/trees/drafts.server";
import { publishDraft } from "../../app/models/trees/publish.server";
import * as notesApi from "../../app/routes/api.runs.$runId.notes";
import * as outcomeApi from "../../app/routes/api.runs.$runId.outcome";
import * as photosApi from "../../app/routes/api.runs.$runId.photos";
import * as sendApi from "../../app/routes/api.reports.$reportId.send";
import { TINY_PNG } from "../support/photo";
import { cookieFor, requestWith, routeArgs } from "../support/session";
import { freshShop, type FreshShop } from "../support/shops";
import { objectKeys } from "../support/storage";
import { smallTree } from "../support/trees";

afterAll(() => closeDb());

let s: FreshShop;
let treeId: string;
const cookie: Record<string, string> = {};

beforeAll(async () => {
  s = await freshShop();
  ({ treeId } = await createDraftTree(s.people.lead, smallTree(`Inputs ${crypto.randomUUID().slice(0, 6)}`)));
  await publishDraft(s.people.lead, treeId, 1, "First");
  for (const role of ["technician", "lead", "trainer", "owner"] as const) cookie[role] = (await cookieFor(s.people[role].email)).cookie;
});

/** A run of the small tree held by the technician, standing at its "failed capacitor" outcome. */
async function runAtOutcome() {
  const call = await createCall(s.people.lead, {
    unitId: s.unitId,
    symptom: "fan hums",
    priority: "normal",
    assignedTo: s.people.technician.userId,
    notes: null,
  });
  const { runId } = await startRun(s.people.technician, { treeId, callId: call.id });
  await postStep(s.people.technician, runId, { key: crypto.randomUUID(), entry: { type: "answer", node: "cap-look", answer: "yes" } });
  return runId;
}

const json = (who: string, path: string, body: unknown) =>
  requestWith(cookie[who]!, path, {
    method: "POST",
    headers: { origin: "http://localhost", "content-type": "application/json" },
    body: JSON.stringify(body),
  });

describe("the outcome takes numbers only as numbers", () => {
  const send = (runId: string, body: unknown) =>
    outcomeApi.action(routeArgs(json("technician", `/api/runs/${runId}/outcome`, body), { runId })) as Promise<Response>;
  const part = { partNumber: "RC-15", description: "Motor-run capacitor 1.5 µF", quantity: 1 };

  it('minutes: true, minutes: "30", quantity: true and quantity: "2" are refused (400) naming the field; the run stays open', async () => {
    const runId = await runAtOutcome();
    for (const [body, field] of [
      [{ action: "Replaced the capacitor.", minutes: true, parts: [] }, "minutes"],
      [{ action: "Replaced the capacitor.", minutes: "30", parts: [] }, "minutes"],
      [{ action: "Replaced the capacitor.", minutes: 30, parts: [{ ...part, quantity: true }] }, "parts[0].quantity"],
      [{ action: "Replaced the capacitor.", minutes: 30, parts: [{ ...part, quantity: "2" }] }, "parts[0].quantity"],
      [{ action: "Replaced the capacitor.", minutes: 1e308, parts: [] }, "minutes"],
    ] as const) {
      const res = await send(runId, body);
      expect(res.status, JSON.stringify(body)).toBe(400);
      expect(Object.keys(((await res.json()) as { fields: object }).fields)).toEqual([field]);
    }
    const [run] = await db().select({ status: runs.status }).from(runs).where(eq(runs.id, runId));
    expect(run!.status).toBe("active");
    const ok = await send(runId, { action: "Replaced the capacitor.", minutes: 30, parts: [part] });
    expect(ok.status).toBe(200);
  });
});

describe("a photo names a step of the run's tree", () => {
  it("a step that is not in the tree is refused (422) like a note's; nothing is stored", async () => {
    const runId = await runAtOutcome();
    const prefix = `${s.shopId}/run-photos/`;
    const before = await objectKeys(prefix);
    const upload = (node: string) => {
      const form = new FormData();
      form.set("key", crypto.randomUUID());
      form.set("node", node);
      form.set("photo", new Blob([TINY_PNG], { type: "image/png" }), "cap.png");
      return photosApi.action(
        routeArgs(
          requestWith(cookie.technician!, `/api/runs/${runId}/photos`, {
            method: "POST",
            headers: { origin: "http://localhost" },
            body: form,
          }),
          { runId },
        ),
      ) as Promise<Response>;
    };
    const refused = await upload("not-a-step-here");
    expect(refused.status).toBe(422);
    expect(await refused.json()).toEqual({ error: "That step is not in this run's tree." });
    const note = (await notesApi.action(
      routeArgs(json("technician", `/api/runs/${runId}/notes`, { key: crypto.randomUUID(), node: "not-a-step-here", text: "x" }), {
        runId,
      }),
    )) as Response;
    expect(note.status).toBe(422);
    const [rows] = await db().select({ n: count() }).from(runPhotos).where(eq(runPhotos.runId, runId));
    expect(rows!.n).toBe(0);
    expect(await objectKeys(prefix)).toEqual(before);
    expect((await upload("cap-look")).status).toBe(201);
  });
});

describe("e-mailing a customer's report", () => {
  const send = (who: string, reportId: string) =>
    sendApi.action(routeArgs(json(who, `/api/reports/${reportId}/send`, {}), { reportId })) as Promise<Response>;

  it("is for the roles that work calls: the trainer is refused (403) and nothing goes out", async () => {
    const { reportId } = await recordOutcome(s.people.technician, await runAtOutcome(), { action: "Replaced it.", minutes: 20, parts: [] });
    const res = await send("trainer", reportId);
    expect(res.status).toBe(403);
    expect((await res.json()).error).toMatch(/technicians, leads and owners/);
    const [row] = await db().select().from(reports).where(eq(reports.id, reportId));
    expect(row).toMatchObject({ sentAt: null, sendCount: 0 });
  });

  it(`goes again only ${REPORT_SENDING.minutesBetween} minutes after the last sending, and at most ${REPORT_SENDING.perDay} times in 24 hours`, async () => {
    const { reportId } = await recordOutcome(s.people.technician, await runAtOutcome(), { action: "Replaced it.", minutes: 20, parts: [] });
    const statuses: number[] = [];
    for (let i = 0; i < REPORT_SENDING.perDay + 1; i++) {
      statuses.push((await send(i % 2 ? "lead" : "owner", reportId)).status);
      // At once: refused, whoever asks.
      statuses.push((await send("technician", reportId)).status);
      // The clock moves on past the pause (the row's last sending set back, as time would).
      await db()
        .update(reports)
        .set({ sentAt: new Date(Date.now() - (REPORT_SENDING.minutesBetween + 1) * 60_000) })
        .where(eq(reports.id, reportId));
    }
    expect(statuses).toEqual([...Array(REPORT_SENDING.perDay).fill([200, 429]).flat(), 429, 429]);
    const last = await send("owner", reportId);
    expect(await last.json()).toMatchObject({ code: "sent-too-often" });
    const [row] = await db().select({ sendCount: reports.sendCount }).from(reports).where(eq(reports.id, reportId));
    expect(row!.sendCount).toBe(REPORT_SENDING.perDay);
  });

  it("two sendings started together: one goes out, the other is refused", async () => {
    const { reportId } = await recordOutcome(s.people.technician, await runAtOutcome(), { action: "Replaced it.", minutes: 20, parts: [] });
    const statuses = (await Promise.all([send("technician", reportId), send("owner", reportId)])).map((r) => r.status).sort();
    expect(statuses).toEqual([200, 429]);
  });
});

describe("text with a lone UTF-16 surrogate", () => {
  // "\ud83d" is half of a surrogate pair (the first half of 🔥, U+1F525): no character on its own,
  // and UTF-8 can't encode it (RFC 3629 §3), so it is stored as U+FFFD, the replacement character.
  const text = "Terminal \ud83d scorched";

  it("a note with one is stored normalised, and its identical retry replays instead of a 422", async () => {
    const runId = await runAtOutcome();
    const key = crypto.randomUUID();
    const post = () =>
      notesApi.action(
        routeArgs(json("technician", `/api/runs/${runId}/notes`, { key, node: "cap-look", text }), { runId }),
      ) as Promise<Response>;
    const first = await post();
    expect(first.status).toBe(200);
    const retry = await post();
    expect(retry.status).toBe(200);
    expect(((await retry.json()) as { note: { id: string } }).note.id).toBe(((await first.json()) as { note: { id: string } }).note.id);
    const stored = await db()
      .select({ text: runNotes.text })
      .from(runNotes)
      .where(and(eq(runNotes.runId, runId), eq(runNotes.idempotencyKey, key)));
    expect(stored).toEqual([{ text: "Terminal \ufffd scorched" }]);
  });
});
