// Service reports: the record of a finished run for the customer, shown as a printable page and
// e-mailed to the site contact (photos attached and shown inline).
import { and, asc, count, eq, gt, isNull, sql } from "drizzle-orm";
import { auditEvents, reports, runNotes, runParts, runPhotos, runs, runSteps, serviceCalls, shops, users } from "../../../db/schema";
import type { OutcomeNode } from "../../engine/types";
import { describeMeter } from "../../engine/verdict";
import type { Ctx } from "../../lib/context";
import { db, writeTx } from "../../lib/db.server";
import { sendMail } from "../../lib/mail.server";
import { authorize } from "../../lib/policy";
import { notFound, Refusal } from "../../lib/refusal";
import { HAZARD_WORD, reportNumber, VERDICT_WORD, type ReportData } from "../../lib/report-data";
import { CONFIRMED_NOTE } from "../../lib/run-log";
import { byCaller, recordAudit } from "../_audit.server";
import { unitWithPlace } from "../_query.server";
import { photosWithBytes } from "./photos.server";
import { versionContent } from "./_version.server";

const iso = (d: Date | null) => (d ? d.toISOString() : null);

/** "1470 nF (1.47 µF)" when typed in another unit than the step's, else the engine's "1.47 µF". */
function readingText(typed: string | null, message: string | null): string {
  // The engine's message starts with the reading, "57.2 °C = 134.96 °F" when converted: keep the step's unit.
  const shown = (message?.split(" — ")[0] ?? "").split(" = ").pop()!;
  if (!typed) return shown;
  const squash = (x: string) => x.replace(/\s+/g, "").toLowerCase();
  return !shown || squash(typed) === squash(shown) ? shown || typed : `${typed} (${shown})`;
}

/** The report with everything it shows, for the caller's shop only. */
export async function getReport(ctx: Ctx, reportId: string): Promise<ReportData & { runId: string }> {
  authorize(ctx, "reports.view");
  const [row] = await db()
    .select({ report: reports, run: runs, shop: shops, technician: users.name })
    .from(reports)
    .innerJoin(runs, eq(runs.id, reports.runId))
    .innerJoin(shops, eq(shops.id, reports.shopId))
    .innerJoin(users, eq(users.id, runs.technicianId))
    .where(and(eq(reports.id, reportId), eq(reports.shopId, ctx.shopId)))
    .limit(1);
  if (!row) notFound("That report");
  const { report, run, shop } = row;
  const content = await versionContent(ctx, run.versionId);
  const nodes = new Map(content.tree.nodes.map((n) => [n.id, n]));
  const title = (key: string | null) => (key ? (nodes.get(key)?.title ?? key) : "");

  const [steps, notes, photos, partRows, call, place] = await Promise.all([
    db()
      .select()
      .from(runSteps)
      .where(and(eq(runSteps.runId, run.id), eq(runSteps.undone, false)))
      .orderBy(asc(runSteps.seq)),
    db()
      .select({ note: runNotes, author: users.name })
      .from(runNotes)
      .innerJoin(users, eq(users.id, runNotes.authorId))
      .where(eq(runNotes.runId, run.id))
      .orderBy(asc(runNotes.createdAt)),
    db()
      .select({ id: runPhotos.id, node: runPhotos.nodeKey })
      .from(runPhotos)
      .where(and(eq(runPhotos.runId, run.id), isNull(runPhotos.deletedAt)))
      .orderBy(asc(runPhotos.createdAt)),
    db().select().from(runParts).where(eq(runParts.runId, run.id)).orderBy(asc(runParts.position)),
    run.callId ? db().select().from(serviceCalls).where(eq(serviceCalls.id, run.callId)).limit(1) : Promise.resolve([]),
    run.unitId ? unitWithPlace(ctx, run.unitId) : Promise.resolve(null),
  ]);
  const standing = steps.filter((s) => s.type !== "undo");
  const outcome = run.endNode ? nodes.get(run.endNode) : undefined;
  const c = call[0];
  const p = place;
  return {
    runId: run.id,
    id: report.id,
    number: report.number,
    createdAt: report.createdAt.toISOString(),
    sentTo: report.sentTo,
    sentAt: iso(report.sentAt),
    shop: { name: shop.name, town: shop.town, footer: shop.settings.reportFooter ?? null, timeZone: shop.settings.timeZone || "UTC" },
    call: c ? { number: c.number, symptom: c.symptom, openedAt: c.openedAt.toISOString() } : null,
    unit: p
      ? { make: p.unit.make, model: p.unit.model, serial: p.unit.serial, category: p.unit.category, installedOn: p.unit.installedOn }
      : null,
    site: p ? { name: p.site.name, address: p.site.address, contactName: p.site.contactName, contactEmail: p.site.contactEmail } : null,
    customer: p?.customer.name ?? null,
    technician: row.technician,
    procedure: { title: content.title, version: content.number },
    startedAt: run.startedAt.toISOString(),
    completedAt: iso(run.completedAt),
    rootCause: run.rootCause,
    remedy: outcome?.kind === "outcome" ? (outcome as OutcomeNode).remedy : null,
    actionTaken: run.actionTaken,
    minutesOnJob: run.minutesOnJob,
    readings: standing
      .filter((s) => s.type === "reading")
      .map((s) => ({
        seq: s.seq,
        title: title(s.nodeKey),
        reading: readingText(s.typed, s.message),
        confirmed: s.confirmed,
        verdict: s.verdict,
        limits: s.limits?.text ?? null,
        derivation: s.limits && !s.limits.fixed ? s.limits.derivation : null,
        meter: s.meter && s.unit ? describeMeter(s.meter, s.unit) : null,
        at: s.recordedAt.toISOString(),
      })),
    nameplate: standing.filter((s) => s.type === "nameplate").map((s) => ({ title: title(s.nodeKey), value: s.message ?? s.typed ?? "" })),
    checks: standing.filter((s) => s.type === "answer").map((s) => ({ title: title(s.nodeKey), answer: s.answer ?? "" })),
    cautions: standing
      .filter((s) => s.type === "acknowledge")
      .map((s) => {
        const n = s.nodeKey ? nodes.get(s.nodeKey) : undefined;
        return { title: title(s.nodeKey), hazard: n?.kind === "caution" ? (n.hazard ?? null) : null };
      }),
    notes: notes.map((n) => ({ step: title(n.note.nodeKey), text: n.note.text, author: n.author })),
    photos: photos.map((ph) => ({ id: ph.id, step: title(ph.node) })),
    parts: partRows.map((x) => ({ partNumber: x.partNumber, description: x.description, quantity: x.quantity })),
  };
}

function reportText(r: ReportData): string {
  const lines = [
    `${r.shop.name} · ${r.shop.town}`,
    `Service report ${reportNumber(r.number)}`,
    "",
    r.unit ? `Unit: ${r.unit.make} ${r.unit.model}, serial ${r.unit.serial}` : "",
    r.site ? `Site: ${r.site.name}, ${r.site.address}` : "",
    r.call ? `Reported: ${r.call.symptom}` : "",
    `Technician: ${r.technician}`,
    "",
    `What we found: ${r.rootCause ?? "—"}`,
    `What we did: ${r.actionTaken ?? "—"}`,
    r.minutesOnJob !== null ? `Time on the job: ${r.minutesOnJob} min` : "",
    "",
    "Parts used:",
    ...(r.parts.length ? r.parts.map((p) => `  ${p.quantity} × ${p.description}${p.partNumber ? ` (${p.partNumber})` : ""}`) : ["  none"]),
    "",
    "Readings:",
    ...(r.readings.length
      ? r.readings.map(
          (x) =>
            `  ${x.title}: ${x.reading}${x.confirmed ? ` ${CONFIRMED_NOTE}` : ""} — ${x.verdict ? VERDICT_WORD[x.verdict] : "—"}${x.limits ? ` (limits ${x.limits})` : ""}`,
        )
      : ["  none"]),
    "",
    "Safety precautions taken:",
    ...(r.cautions.length
      ? r.cautions.map((c) => `  ${c.hazard ? `${HAZARD_WORD[c.hazard] ?? c.hazard}: ` : ""}${c.title}`)
      : ["  none called for"]),
    r.photos.length ? `\n${r.photos.length} photo${r.photos.length === 1 ? "" : "s"} attached.` : "",
  ];
  return lines.filter((l, i, all) => l !== "" || (all[i - 1] ?? "") !== "").join("\n");
}

/**
 * Renders the report as the e-mail's HTML document: `photoSrc` names each attached photo (a cid:
 * link), `note` is a line to add at the end (photos left out of the mail), or null.
 */
export type ReportMailRenderer = (report: ReportData, photoSrc: (id: string) => string, note: string | null) => string;

/**
 * How often one report may be e-mailed (docs/decisions/0243): again only 10 minutes after the last
 * sending, and at most 5 times in 24 hours. A customer who lost the mail gets it again; a double tap,
 * a script or a grudge does not fill their inbox.
 */
export const REPORT_SENDING = { minutesBetween: 10, perDay: 5 } as const;

/**
 * Claims the next sending of a report, or refuses it (429) under REPORT_SENDING. The claim stamps
 * `sent_at` at once, so two sendings started together cannot both go out; `release` gives the
 * claim back when the mail server refuses the message.
 */
async function claimSending(ctx: Ctx, reportId: string, now: Date): Promise<{ release: () => Promise<void> }> {
  const previous = await writeTx(async (tx) => {
    const [row] = await tx
      .select({ sentAt: reports.sentAt })
      .from(reports)
      .where(and(eq(reports.id, reportId), eq(reports.shopId, ctx.shopId)))
      .for("update");
    if (!row) notFound("That report");
    const wait = row.sentAt ? REPORT_SENDING.minutesBetween - Math.floor((now.getTime() - row.sentAt.getTime()) / 60_000) : 0;
    if (wait > 0) {
      throw new Refusal(
        "too-many",
        `This report was e-mailed less than ${REPORT_SENDING.minutesBetween} minutes ago. It can be sent again in ${wait} minute${wait === 1 ? "" : "s"}.`,
        {
          code: "sent-recently",
          details: { retryInMinutes: wait },
        },
      );
    }
    const [day] = await tx
      .select({ n: count() })
      .from(auditEvents)
      .where(
        and(
          eq(auditEvents.shopId, ctx.shopId),
          eq(auditEvents.action, "report.sent"),
          eq(auditEvents.subjectId, reportId),
          gt(auditEvents.at, new Date(now.getTime() - 86_400_000)),
        ),
      );
    if ((day?.n ?? 0) >= REPORT_SENDING.perDay) {
      throw new Refusal(
        "too-many",
        `This report has been e-mailed ${REPORT_SENDING.perDay} times in the last 24 hours; it can't be sent again today.`,
        { code: "sent-too-often" },
      );
    }
    await tx.update(reports).set({ sentAt: now }).where(eq(reports.id, reportId));
    return row.sentAt;
  });
  return {
    release: async () => {
      await db()
        .update(reports)
        .set({ sentAt: previous })
        .where(and(eq(reports.id, reportId), eq(reports.sentAt, now)));
    },
  };
}

/**
 * E-mails the report to the site contact, photos attached and shown inline: the roles that work
 * calls, at most as often as REPORT_SENDING says. The sending is recorded in the audit trail.
 */
export async function sendReport(ctx: Ctx, reportId: string, renderHtml: ReportMailRenderer): Promise<{ to: string; messageId: string }> {
  authorize(ctx, "reports.send");
  const r = await getReport(ctx, reportId);
  if (!r.site?.contactEmail)
    throw new Refusal("conflict", "The site has no contact e-mail address: add one on the site's page first.", { code: "no-contact" });
  const to = r.site.contactEmail;
  const now = new Date();
  const claim = await claimSending(ctx, reportId, now);
  let messageId: string;
  try {
    const { photos, left } = await photosWithBytes(ctx, r.runId);
    const cid = (id: string) => `photo-${id}@cluepath`;
    const shown = { ...r, photos: r.photos.filter((p) => photos.some((x) => x.id === p.id)) };
    const note = left
      ? `${left} more photo${left === 1 ? " is" : "s are"} kept with the report; ask ${r.shop.name} for ${left === 1 ? "it" : "them"}.`
      : null;
    const html = renderHtml(shown, (id) => `cid:${cid(id)}`, note);
    const subject = `Service report ${reportNumber(r.number)}${r.unit ? ` — ${r.unit.make} ${r.unit.model}` : ""}${r.site ? ` at ${r.site.name}` : ""}`;
    ({ messageId } = await sendMail({
      shopId: ctx.shopId,
      reportId,
      to,
      subject,
      text: reportText(r),
      html,
      attachments: photos.map((p, i) => ({
        filename: `photo-${i + 1}.${p.ext}`,
        content: p.body,
        contentType: p.contentType,
        cid: cid(p.id),
      })),
    }));
  } catch (e) {
    await claim.release().catch(() => undefined);
    if (e instanceof Refusal) throw e;
    console.error("report mail failed:", e instanceof Error ? e.message : e);
    throw new Refusal("unavailable", "The mail server did not take the report. Try again in a minute.");
  }
  await writeTx(async (tx) => {
    await tx
      .update(reports)
      .set({ sentTo: to, sentAt: now, messageId: messageId.slice(0, 300), sendCount: sql`${reports.sendCount} + 1` })
      .where(and(eq(reports.id, reportId), eq(reports.shopId, ctx.shopId)));
    await recordAudit(
      {
        ...byCaller(ctx),
        action: "report.sent",
        subjectType: "report",
        subjectId: reportId,
        summary: `E-mailed service report ${reportNumber(r.number)} to ${to}`,
        details: { to, number: r.number, runId: r.runId },
      },
      tx,
    );
  });
  return { to, messageId };
}
