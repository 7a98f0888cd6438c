// Notes on a run's steps, written by the technician holding the run, with an idempotency key.
import { and, eq } from "drizzle-orm";
import { z } from "zod";
import { runNotes, runs, users } from "../../../db/schema";
import type { Ctx } from "../../lib/context";
import { writeTx } from "../../lib/db.server";
import { authorize } from "../../lib/policy";
import { notFound, Refusal } from "../../lib/refusal";
import type { NoteView } from "../../lib/run-log";
import { lockOwn } from "../_query.server";
import { nodeOf, OPEN, versionContent } from "./_version.server";
import { nodeKey } from "./steps.server";

export const noteInput = z.object({
  key: z.string().uuid(),
  node: nodeKey,
  text: z.string().trim().min(1, "Write the note first.").max(2000, "Keep a note under 2000 characters."),
  /** The phone's clock when the note was written. */
  at: z.iso.datetime({ offset: true }).nullish(),
});
export type NoteInput = z.infer<typeof noteInput>;

/** Adds a note to a step. The same key again answers with the stored note; with other text it is refused. */
export async function addNote(ctx: Ctx, runId: string, input: NoteInput): Promise<{ note: NoteView }> {
  authorize(ctx, "runs.view");
  return writeTx(async (tx) => {
    const run = (await lockOwn(tx, ctx, runs, runId)) ?? notFound("That run");
    const [existing] = await tx
      .select()
      .from(runNotes)
      .where(and(eq(runNotes.runId, runId), eq(runNotes.idempotencyKey, input.key)))
      .limit(1);
    const [me] = await tx.select({ name: users.name }).from(users).where(eq(users.id, ctx.userId));
    const view = (n: typeof runNotes.$inferSelect): NoteView => ({
      id: n.id,
      key: n.idempotencyKey,
      node: n.nodeKey,
      text: n.text,
      author: me?.name ?? "",
      createdAt: n.createdAt.toISOString(),
    });
    if (existing) {
      if (existing.text !== input.text || existing.nodeKey !== input.node)
        throw new Refusal("rejected", "This idempotency key was already used for a different note.", { code: "key-reused" });
      return { note: view(existing) };
    }
    authorize(ctx, "runs.note", { holder: run.technicianId === ctx.userId });
    if (!OPEN.includes(run.status)) throw new Refusal("conflict", "This run is closed.", { code: "closed" });
    const content = await versionContent(ctx, run.versionId, tx);
    if (!nodeOf(content.tree, input.node)) throw new Refusal("rejected", "That step is not in this run's tree.");
    const note = {
      id: crypto.randomUUID(),
      runId,
      shopId: ctx.shopId,
      nodeKey: input.node,
      idempotencyKey: input.key,
      text: input.text,
      authorId: ctx.userId,
      clientAt: input.at ? new Date(input.at) : null,
      createdAt: new Date(),
    };
    await tx.insert(runNotes).values(note);
    return { note: view(note) };
  });
}
