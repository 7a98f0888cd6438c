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
import type { Ctx } from "../lib/context";
import { db, writeTx } from "../lib/db.server";
import { optionalText } from "../lib/forms";
import { rankTrees, type TreeFit, type UnitKind } from "../lib/tree-match";
import { authorize } from "../lib/policy";
import { fieldRefusal, notFound } from "../lib/refusal";
import { nextNumber, withPlace } from "./_query.server";
import { searchUnits } from "./equipment.server";
import { recordNewCall } from "./insights/_facts.server";
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
  return withPlace(
    db().select(callColumns()).from(serviceCalls).innerJoin(equipmentUnits, eq(equipmentUnits.id, serviceCalls.unitId)).$dynamic(),
  ).leftJoin(assignee, eq(assignee.id, serviceCalls.assignedTo));
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
        filter.status === "active"
          ? inArray(serviceCalls.status, ACTIVE)
          : filter.status
            ? eq(serviceCalls.status, filter.status)
            : undefined,
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

/** The caller's open calls, with the run in progress on each (if any) and who holds it (a lead may have taken it over). */
export async function myCalls(ctx: Ctx) {
  authorize(ctx, "calls.mine");
  const calls = await callsQuery()
    .where(and(eq(serviceCalls.shopId, ctx.shopId), eq(serviceCalls.assignedTo, ctx.userId), inArray(serviceCalls.status, ACTIVE)))
    .orderBy(PRIORITY_ORDER, asc(serviceCalls.openedAt));
  const holder = alias(users, "holder");
  const open = calls.length
    ? await db()
        .select({ id: runs.id, callId: runs.callId, status: runs.status, holderId: runs.technicianId, holder: holder.name })
        .from(runs)
        .innerJoin(holder, eq(holder.id, runs.technicianId))
        .where(
          and(
            eq(runs.shopId, ctx.shopId),
            inArray(
              runs.callId,
              calls.map((c) => c.id),
            ),
            inArray(runs.status, ["active", "paused", "escalated"]),
          ),
        )
    : [];
  return calls.map((c) => {
    const run = open.find((r) => r.callId === c.id);
    return { ...c, openRun: run ? { id: run.id, status: run.status, holder: run.holder, heldByMe: run.holderId === ctx.userId } : null };
  });
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

/** The shop's technicians and leads whose access is on: who can be sent on a call. */
export async function assignablePeople(ctx: Ctx) {
  authorize(ctx, "calls.view");
  return db()
    .select({ id: users.id, name: users.name, role: memberships.role })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(and(eq(memberships.shopId, ctx.shopId), inArray(memberships.role, ["technician", "lead"]), isNull(memberships.deactivatedAt)))
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
  if (input.assignedTo && !(await assignablePeople(ctx)).some((p) => p.id === input.assignedTo))
    throw fieldRefusal("assignedTo", "Choose a technician or lead of your shop.");
}

/** Opens a call with the shop's next number. */
export async function createCall(ctx: Ctx, input: CallInput): Promise<{ id: string; number: number }> {
  authorize(ctx, "calls.write");
  await checkRefs(ctx, input);
  const id = crypto.randomUUID();
  const now = new Date();
  return writeTx(async (tx) => {
    const number = await nextNumber(tx, ctx.shopId, "call");
    await tx
      .insert(serviceCalls)
      .values({ id, shopId: ctx.shopId, number, ...input, status: "open", openedBy: ctx.userId, openedAt: now, updatedAt: now });
    await recordNewCall(tx, ctx.shopId, input.unitId, now);
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

export type TreeSuggestion = PublishedTreeSummary & TreeFit;

/**
 * Published trees for a call on a unit, best first (`rankTrees`): those that fit the unit's
 * category and kind ranked by the words of the reported symptom, then the same category's trees
 * for another kind (a convection oven's tree for a deck oven), then the rest of the library.
 */
export async function suggestTrees(ctx: Ctx, unit: UnitKind, symptom: string): Promise<TreeSuggestion[]> {
  authorize(ctx, "trees.view");
  return rankTrees(unit, symptom, await listPublished(ctx));
}

/** Calls on one unit, newest first (the unit's history). */
export async function callsOfUnit(ctx: Ctx, unitId: string) {
  authorize(ctx, "calls.view");
  return callsQuery()
    .where(and(eq(serviceCalls.shopId, ctx.shopId), eq(serviceCalls.unitId, unitId)))
    .orderBy(desc(serviceCalls.openedAt));
}
