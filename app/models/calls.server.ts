// Service calls: a unit, what the customer reported, who goes. Always scoped to the caller's shop.
import { and, asc, desc, eq, inArray, isNull, or, sql } from "drizzle-orm";
import { alias } from "drizzle-orm/mysql-core";
import { z } from "zod";
import {
  CALL_PRIORITIES,
  CALL_STATUSES,
  customers,
  equipmentUnits,
  memberships,
  runs,
  serviceCalls,
  sites,
  users,
  type CallPriority,
  type CallStatus,
} from "../../db/schema";
import type { EquipmentCategory } from "../engine/types";
import type { Ctx } from "../lib/context";
import { db, writeTx } from "../lib/db.server";
import { optionalText } from "../lib/forms";
import { authorize } from "../lib/policy";
import { fieldRefusal, notFound } from "../lib/refusal";
import { nextNumber, withPlace } from "./_query.server";
import { searchUnits } from "./equipment.server";
import { listPublished, type PublishedTreeSummary } from "./trees/library.server";


export const callInput = z.object({
  unitId: z.string().uuid("Choose the unit the call is about."),
  symptom: z.string().trim().min(3, "Say what the customer reported, in a few words.").max(300, "Keep it under 300 characters."),
  priority: z.enum(CALL_PRIORITIES, { message: "Choose a priority." }),
  assignedTo: z.preprocess((v) => (v === "" ? null : v), z.string().uuid("Choose a technician.").nullable()),
  notes: optionalText(2000, "Keep the notes under 2000 characters."),
});
export type CallInput = z.infer<typeof callInput>;
export const callEditInput = callInput.extend({ status: z.enum(CALL_STATUSES, { message: "Choose a status." }) });
export type CallEditInput = z.infer<typeof callEditInput>;

const assignee = alias(users, "assignee");

function callColumns() {
  return {
    id: serviceCalls.id,
    number: serviceCalls.number,
    symptom: serviceCalls.symptom,
    priority: serviceCalls.priority,
    status: serviceCalls.status,
    openedAt: serviceCalls.openedAt,
    closedAt: serviceCalls.closedAt,
    assignedTo: serviceCalls.assignedTo,
    assigneeName: assignee.name,
    unitId: equipmentUnits.id,
    category: equipmentUnits.category,
    make: equipmentUnits.make,
    model: equipmentUnits.model,
    serial: equipmentUnits.serial,
    siteName: sites.name,
    siteAddress: sites.address,
    customerName: customers.name,
  };
}

function callsQuery() {
  return withPlace(db().select(callColumns()).from(serviceCalls).innerJoin(equipmentUnits, eq(equipmentUnits.id, serviceCalls.unitId)).$dynamic()).leftJoin(
    assignee,
    eq(assignee.id, serviceCalls.assignedTo),
  );
}

const PRIORITY_ORDER = sql`FIELD(${serviceCalls.priority}, 'urgent', 'high', 'normal', 'low')`;

export type CallFilter = {
  q?: string;
  status?: CallStatus | "active";
  assigned?: "me" | "unassigned" | string;
  priority?: CallPriority;
};

const ACTIVE: CallStatus[] = ["open", "in_progress", "escalated"];

export async function listCalls(ctx: Ctx, filter: CallFilter = {}) {
  authorize(ctx, "calls.view");
  const term = filter.q?.trim();
  const pattern = term ? `%${term.replace(/[\\%_]/g, (c) => `\\${c}`)}%` : "";
  const number = term && /^#?\d+$/.test(term) ? Number(term.replace("#", "")) : null;
  return callsQuery()
    .where(
      and(
        eq(serviceCalls.shopId, ctx.shopId),
        filter.status === "active" ? inArray(serviceCalls.status, ACTIVE) : filter.status ? eq(serviceCalls.status, filter.status) : undefined,
        filter.priority ? eq(serviceCalls.priority, filter.priority) : undefined,
        filter.assigned === "me"
          ? eq(serviceCalls.assignedTo, ctx.userId)
          : filter.assigned === "unassigned"
            ? isNull(serviceCalls.assignedTo)
            : filter.assigned
              ? eq(serviceCalls.assignedTo, filter.assigned)
              : undefined,
        term
          ? or(
              number !== null ? eq(serviceCalls.number, number) : undefined,
              sql`${serviceCalls.symptom} LIKE ${pattern}`,
              sql`${customers.name} LIKE ${pattern}`,
              sql`${sites.name} LIKE ${pattern}`,
              sql`${equipmentUnits.model} LIKE ${pattern}`,
              sql`${equipmentUnits.serial} LIKE ${pattern}`,
            )
          : undefined,
      ),
    )
    .orderBy(sql`${serviceCalls.status} IN ('done', 'cancelled')`, PRIORITY_ORDER, desc(serviceCalls.openedAt))
    .limit(200);
}

/** The caller's open calls, with the run in progress on each (if any). */
export async function myCalls(ctx: Ctx) {
  authorize(ctx, "calls.mine");
  const calls = await callsQuery()
    .where(and(eq(serviceCalls.shopId, ctx.shopId), eq(serviceCalls.assignedTo, ctx.userId), inArray(serviceCalls.status, ACTIVE)))
    .orderBy(PRIORITY_ORDER, asc(serviceCalls.openedAt));
  const open = calls.length
    ? await db()
        .select({ id: runs.id, callId: runs.callId, status: runs.status })
        .from(runs)
        .where(and(eq(runs.shopId, ctx.shopId), inArray(runs.callId, calls.map((c) => c.id)), inArray(runs.status, ["active", "paused", "escalated"])))
    : [];
  return calls.map((c) => ({ ...c, openRun: open.find((r) => r.callId === c.id) ?? null }));
}

/** Calls the caller closed in the last `days` days. */
export async function recentlyDone(ctx: Ctx, days = 7) {
  authorize(ctx, "calls.mine");
  return callsQuery()
    .where(
      and(
        eq(serviceCalls.shopId, ctx.shopId),
        eq(serviceCalls.assignedTo, ctx.userId),
        eq(serviceCalls.status, "done"),
        sql`${serviceCalls.closedAt} >= ${new Date(Date.now() - days * 86_400_000)}`,
      ),
    )
    .orderBy(desc(serviceCalls.closedAt))
    .limit(20);
}

async function callRow(ctx: Ctx, id: string) {
  const [row] = await withPlace(
    db()
      .select({ call: serviceCalls, unit: equipmentUnits, site: sites, customer: customers, assigneeName: assignee.name })
      .from(serviceCalls)
      .innerJoin(equipmentUnits, eq(equipmentUnits.id, serviceCalls.unitId))
      .$dynamic(),
  )
    .leftJoin(assignee, eq(assignee.id, serviceCalls.assignedTo))
    .where(and(eq(serviceCalls.id, id), eq(serviceCalls.shopId, ctx.shopId)))
    .limit(1);
  return row ?? notFound("That service call");
}

/** One call with its unit, site, customer and assignee. */
export async function getCall(ctx: Ctx, id: string) {
  authorize(ctx, "calls.view");
  return callRow(ctx, id);
}

/** The shop's technicians and leads, who can be sent on a call. */
export async function assignablePeople(ctx: Ctx) {
  authorize(ctx, "calls.view");
  return db()
    .select({ id: users.id, name: users.name, role: memberships.role })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(and(eq(memberships.shopId, ctx.shopId), inArray(memberships.role, ["technician", "lead"])))
    .orderBy(asc(users.name));
}

/** What the call form offers: the shop's units and the people who can be sent. */
export async function callFormChoices(ctx: Ctx) {
  authorize(ctx, "calls.write");
  const [units, people] = await Promise.all([searchUnits(ctx), assignablePeople(ctx)]);
  return { units, people };
}

/** The call's unit and assignee must be the shop's; a refusal names the field otherwise. */
async function checkRefs(ctx: Ctx, input: CallInput): Promise<void> {
  const [unit] = await db()
    .select({ id: equipmentUnits.id })
    .from(equipmentUnits)
    .where(and(eq(equipmentUnits.id, input.unitId), eq(equipmentUnits.shopId, ctx.shopId)))
    .limit(1);
  if (!unit) throw fieldRefusal("unitId", "Choose one of your shop's units.");
  if (input.assignedTo && !(await assignablePeople(ctx)).some((p) => p.id === input.assignedTo)) throw fieldRefusal("assignedTo", "Choose a technician or lead of your shop.");
}

/** Opens a call with the shop's next number. */
export async function createCall(ctx: Ctx, input: CallInput): Promise<{ id: string; number: number }> {
  authorize(ctx, "calls.write");
  await checkRefs(ctx, input);
  const id = crypto.randomUUID();
  const now = new Date();
  return writeTx(async (tx) => {
    const number = await nextNumber(tx, ctx.shopId, "call");
    await tx.insert(serviceCalls).values({ id, shopId: ctx.shopId, number, ...input, status: "open", openedBy: ctx.userId, openedAt: now, updatedAt: now });
    return { id, number };
  });
}

/** Changes a call; closing it stamps when, reopening it clears that. */
export async function updateCall(ctx: Ctx, id: string, input: CallEditInput): Promise<void> {
  authorize(ctx, "calls.write");
  const current = await callRow(ctx, id);
  await checkRefs(ctx, input);
  const closing = (input.status === "done" || input.status === "cancelled") && current.call.closedAt === null;
  const reopening = input.status !== "done" && input.status !== "cancelled";
  await db()
    .update(serviceCalls)
    .set({ ...input, updatedAt: new Date(), closedAt: closing ? new Date() : reopening ? null : current.call.closedAt })
    .where(and(eq(serviceCalls.id, id), eq(serviceCalls.shopId, ctx.shopId)));
}

/** Words that carry meaning in a symptom ("heats unevenly" → heat, uneven). */
function words(text: string): Set<string> {
  const out = new Set<string>();
  for (const raw of text.toLowerCase().match(/[a-z]+/g) ?? []) {
    if (raw.length < 3 || STOP.has(raw)) continue;
    out.add(raw.replace(/(?:ly|ing|ed|es|s)$/, "") || raw);
  }
  return out;
}
const STOP = new Set(["the", "and", "not", "one", "than", "other", "side", "unit", "with", "for", "does", "doesn", "won", "from", "but"]);

export type TreeSuggestion = PublishedTreeSummary & { score: number; sameCategory: boolean };

/**
 * Published trees for a call: those of the unit's category first, ranked by how many words of the
 * reported symptom they share with the tree's title and symptom; then the rest of the library.
 */
export async function suggestTrees(ctx: Ctx, category: EquipmentCategory, symptom: string): Promise<TreeSuggestion[]> {
  authorize(ctx, "trees.view");
  const reported = words(symptom);
  const all = await listPublished(ctx);
  return all
    .map((t) => {
      const own = words(`${t.title} ${t.symptom}`);
      let score = 0;
      for (const w of reported) if (own.has(w)) score++;
      return { ...t, score, sameCategory: t.category === category };
    })
    .sort((a, b) => Number(b.sameCategory) - Number(a.sameCategory) || b.score - a.score || a.title.localeCompare(b.title));
}

/** Calls on one unit, newest first (the unit's history). */
export async function callsOfUnit(ctx: Ctx, unitId: string) {
  authorize(ctx, "calls.view");
  return callsQuery()
    .where(and(eq(serviceCalls.shopId, ctx.shopId), eq(serviceCalls.unitId, unitId)))
    .orderBy(desc(serviceCalls.openedAt));
}
