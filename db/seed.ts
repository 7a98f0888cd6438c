// Idempotent demo seed: run it any number of times; it adds what is missing and changes nothing else.
import { eq } from "drizzle-orm";
import { createHash } from "node:crypto";
import { readdirSync, readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { customers, equipmentUnits, memberships, meters, runs, serviceCalls, shops, sites, trees, users } from "./schema";
import { DEMO_CALLS, DEMO_CUSTOMERS, DEMO_METERS, DEMO_PASSWORD, DEMO_SHOP, DEMO_USERS, OTHER_SHOP } from "./demo";
import { closeDb, db } from "../app/lib/db.server";
import { hashPassword } from "../app/lib/password.server";
import { formatParseError, parseTree } from "../app/engine/markdown/parse";
import { errorsOf, validateTree } from "../app/engine/validate";
import { createPublishedTree } from "../app/models/trees/drafts.server";
import type { EquipmentCategory } from "./schema";
import type { Quantity } from "../app/engine/types";
import { generateHistory } from "./history";
import { seedDemoTraining } from "./demo-training";

/** A UUID-shaped id derived from a stable key, so the seed can upsert. */
export function stableId(key: string): string {
  const h = createHash("sha256").update(`cluepath-demo:${key}`).digest("hex");
  return `${h.slice(0, 8)}-${h.slice(8, 12)}-4${h.slice(13, 16)}-a${h.slice(17, 20)}-${h.slice(20, 32)}`;
}

const TREES_DIR = fileURLToPath(new URL("../trees/", import.meta.url));

/** The starter trees in trees/, imported into the demo shop as published version 1. */
export async function seedStarterTrees(shopId: string, authorId: string): Promise<number> {
  let added = 0;
  for (const file of readdirSync(TREES_DIR)
    .filter((f) => f.endsWith(".md"))
    .sort()) {
    const treeId = stableId(`tree:${file}`);
    const [exists] = await db().select({ id: trees.id }).from(trees).where(eq(trees.id, treeId)).limit(1);
    if (exists) continue;
    const parsed = parseTree(readFileSync(TREES_DIR + file, "utf8"));
    if (!parsed.ok) throw new Error(`trees/${file}: ${parsed.errors.map(formatParseError).join("; ")}`);
    const errors = errorsOf(validateTree(parsed.tree).findings);
    if (errors.length) throw new Error(`trees/${file} does not validate: ${errors.map((e) => e.message).join("; ")}`);
    await createPublishedTree({ shopId, userId: authorId, role: "lead" }, parsed.tree, "Starter tree shipped with Cluepath", {
      treeId,
      versionId: stableId(`tree-version:${file}:1`),
    });
    added++;
  }
  return added;
}

export async function seed(opts: { history?: boolean } = {}): Promise<void> {
  const d = db();
  const shopIds = { demo: stableId(DEMO_SHOP.key), other: stableId(OTHER_SHOP.key) };
  for (const [which, shop] of [
    ["demo", DEMO_SHOP],
    ["other", OTHER_SHOP],
  ] as const) {
    await d
      .insert(shops)
      .values({ id: shopIds[which], name: shop.name, town: shop.town, settings: { timeZone: "America/Chicago" } })
      .onDuplicateKeyUpdate({ set: { id: shopIds[which] } });
  }
  const passwordHash = await hashPassword(DEMO_PASSWORD);
  for (const u of DEMO_USERS) {
    const userId = stableId(`user:${u.email}`);
    await d
      .insert(users)
      .values({ id: userId, email: u.email, name: u.name, passwordHash })
      .onDuplicateKeyUpdate({ set: { id: userId } });
    const membershipId = stableId(`member:${u.email}:${u.shop}`);
    await d
      .insert(memberships)
      .values({ id: membershipId, shopId: shopIds[u.shop], userId, role: u.role })
      .onDuplicateKeyUpdate({ set: { id: membershipId } });
  }
  for (const c of DEMO_CUSTOMERS) {
    const shopId = shopIds[c.shop];
    const customerId = stableId(c.key);
    await d
      .insert(customers)
      .values({ id: customerId, shopId, name: c.name, phone: c.phone })
      .onDuplicateKeyUpdate({ set: { id: customerId } });
    for (const s of c.sites) {
      const siteId = stableId(s.key);
      await d
        .insert(sites)
        .values({
          id: siteId,
          shopId,
          customerId,
          name: s.name,
          address: s.address,
          contactName: s.contactName,
          contactEmail: s.contactEmail,
        })
        .onDuplicateKeyUpdate({ set: { id: siteId } });
      for (const u of s.units) {
        const unitId = stableId(u.key);
        await d
          .insert(equipmentUnits)
          .values({
            id: unitId,
            shopId,
            siteId,
            category: u.category as EquipmentCategory,
            make: u.make,
            model: u.model,
            serial: u.serial,
            installedOn: u.installedOn,
            nameplate: u.nameplate,
          })
          .onDuplicateKeyUpdate({ set: { id: unitId } });
      }
    }
  }
  await seedStarterTrees(shopIds.demo, stableId("user:lead@tinderbox.example"));
  await seedFieldWork(shopIds);
  await seedDemoTraining(shopIds.demo, {
    trainer: stableId("user:trainer@tinderbox.example"),
    technician: stableId("user:tech@tinderbox.example"),
    treeIdOf: (file) => stableId(`tree:${file}`),
  });
  if (opts.history !== false) await seedDemoHistory(shopIds.demo);
}

/**
 * Four months of invented completed runs in the demo shop, so a new owner's overview has
 * something to show (added once). Invented customers and units join the demo's own.
 */
export async function seedDemoHistory(shopId: string): Promise<void> {
  const [done] = await db()
    .select({ id: runs.id })
    .from(runs)
    .where(eq(runs.id, stableId("history:run:1")))
    .limit(1);
  if (done) return;
  const units = await db()
    .select({ id: equipmentUnits.id, category: equipmentUnits.category, make: equipmentUnits.make, model: equipmentUnits.model })
    .from(equipmentUnits)
    .where(eq(equipmentUnits.shopId, shopId))
    .orderBy(equipmentUnits.serial);
  const lead = stableId("user:lead@tinderbox.example");
  await generateHistory({
    shopId,
    runs: 140,
    days: 120,
    end: new Date(Date.now() - 86_400_000),
    seed: 4821,
    idOf: (kind, n) => stableId(`history:${kind}:${n}`),
    technicians: [stableId("user:tech@tinderbox.example"), stableId("user:tech@tinderbox.example"), lead],
    leads: [lead],
    units,
    meanGapDays: 15,
    callNumberFrom: 801,
    reportNumberFrom: 1,
    town: DEMO_SHOP.town,
  });
}

/** The demo shop's meters and the open service calls of both shops (added once, then left alone). */
export async function seedFieldWork(shopIds: { demo: string; other: string }): Promise<void> {
  const d = db();
  const now = new Date();
  for (const m of DEMO_METERS) {
    const id = stableId(m.key);
    const { key: _key, quantity, ...fields } = m;
    await d
      .insert(meters)
      .values({ id, shopId: shopIds.demo, ...fields, quantity: quantity as Quantity, updatedAt: now })
      .onDuplicateKeyUpdate({ set: { id } });
  }
  for (const c of DEMO_CALLS) {
    const id = stableId(c.key);
    const shopId = shopIds[c.shop];
    const opener = c.shop === "demo" ? "lead@tinderbox.example" : "owner@pellham.example";
    await d
      .insert(serviceCalls)
      .values({
        id,
        shopId,
        number: c.number,
        unitId: stableId(c.unit),
        symptom: c.symptom,
        priority: c.priority,
        status: "open",
        assignedTo: c.assignedTo ? stableId(`user:${c.assignedTo}`) : null,
        notes: c.notes ?? null,
        openedBy: stableId(`user:${opener}`),
        openedAt: now,
        updatedAt: now,
      })
      .onDuplicateKeyUpdate({ set: { id } });
  }
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  seed()
    .then(() => console.log(`› demo data ready: ${DEMO_SHOP.name} (${DEMO_SHOP.town}) and ${OTHER_SHOP.name}`))
    .catch((e) => {
      console.error("Seeding failed:", e instanceof Error ? e.message : e);
      process.exitCode = 1;
    })
    .finally(() => closeDb());
}
