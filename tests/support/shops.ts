// A throwaway shop of its own for a test (an owner, a lead, a technician, one customer with a site
// and a unit), so counters and audit trails start empty. Invented names only.
import { memberships, shops, users } from "../../db/schema";
import type { Ctx } from "../../app/lib/context";
import { db } from "../../app/lib/db.server";
import { hashPassword } from "../../app/lib/password.server";
import type { Role } from "../../app/lib/roles";
import { createCustomer, createSite, createUnit } from "../../app/models/equipment.server";

export const FRESH_PASSWORD = "lantern-gauge-7305";

export type FreshShop = {
  shopId: string;
  ctx: Ctx;
  people: Record<Role, Ctx & { email: string; name: string }>;
  siteId: string;
  unitId: string;
};

export async function freshShop(label = crypto.randomUUID().slice(0, 8)): Promise<FreshShop> {
  const shopId = crypto.randomUUID();
  await db()
    .insert(shops)
    .values({ id: shopId, name: `Test shop ${label}`, town: "Wrenfield", settings: { timeZone: "UTC" } });
  const passwordHash = await hashPassword(FRESH_PASSWORD);
  const people = {} as FreshShop["people"];
  for (const role of ["owner", "lead", "technician", "trainer"] as const) {
    const userId = crypto.randomUUID();
    const email = `${role}.${label}@wrenfield.example`;
    const name = `${role[0]!.toUpperCase()}${role.slice(1)} ${label}`;
    await db().insert(users).values({ id: userId, email, name, passwordHash });
    await db().insert(memberships).values({ shopId, userId, role });
    people[role] = { shopId, userId, role, email, name };
  }
  const owner = people.owner;
  const customerId = await createCustomer(owner, { name: `Customer ${label}`, phone: null });
  const siteId = await createSite(owner, customerId, {
    name: "Kitchen",
    address: "2 Mill Row, Wrenfield",
    contactName: "Site contact",
    contactEmail: `kitchen.${label}@wrenfield.example`,
  });
  const unitId = await createUnit(owner, siteId, {
    category: "fryer",
    make: "Testmake",
    model: "F-40",
    serial: `S-${label}`,
    installedOn: null,
  });
  return { shopId, ctx: owner, people, siteId, unitId };
}
