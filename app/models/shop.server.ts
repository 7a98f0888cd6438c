// The caller's shop as the other models need it.
import { eq } from "drizzle-orm";
import { shops } from "../../db/schema";
import type { Ctx } from "../lib/context";
import { db } from "../lib/db.server";
import { authorize } from "../lib/policy";

/** The shop's time zone (from its settings), for showing times; UTC when none is set. */
export async function shopTimeZone(ctx: Ctx): Promise<string> {
  authorize(ctx, "shop.view");
  const [row] = await db().select({ settings: shops.settings }).from(shops).where(eq(shops.id, ctx.shopId)).limit(1);
  return row?.settings.timeZone || "UTC";
}
