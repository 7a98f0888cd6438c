import { afterAll, describe, expect, it } from "vitest";
import { DEMO_SHOP } from "../../db/demo";
import { stableId } from "../../db/seed";
import { closeDb } from "../../app/lib/db.server";
import type { Ctx } from "../../app/lib/context";
import { getCustomer, getSite, getUnit, listUnits } from "../../app/models/equipment.server";
import { loader as unitLoader } from "../../app/routes/equipment.$unitId";
import { cookieFor, requestWith, routeArgs } from "../support/session";

afterAll(() => closeDb());

const shopA = stableId(DEMO_SHOP.key);
const shopB = stableId("shop:pellham");
const asA: Ctx = { shopId: shopA, userId: stableId("user:owner@tinderbox.example"), role: "owner" };
const asB: Ctx = { shopId: shopB, userId: stableId("user:owner@pellham.example"), role: "owner" };
const customerA = stableId("cust:larkspur");
const siteA = stableId("site:larkspur-deli");
const unitA = stableId("unit:larkspur-rotisserie");

describe("shop scope", () => {
  it("a shop sees its own customer, site and unit", async () => {
    expect((await getCustomer(asA, customerA)).name).toBe("Larkspur Market");
    expect((await getSite(asA, siteA)).customerId).toBe(customerA);
    expect((await getUnit(asA, unitA)).unit.serial).toBe("VR22-004417");
  });

  it("another shop asking for them by id is told they were not found", async () => {
    await expect(getCustomer(asB, customerA)).rejects.toMatchObject({ kind: "not-found", status: 404 });
    await expect(getSite(asB, siteA)).rejects.toMatchObject({ kind: "not-found", status: 404 });
    await expect(getUnit(asB, unitA)).rejects.toMatchObject({ kind: "not-found", status: 404 });
    const listed = await listUnits(asB);
    expect(listed.length).toBeGreaterThan(0);
    expect(listed.map((u) => u.id)).not.toContain(unitA);
  });

  it("the unit page answers 404 to a signed-in user of the other shop, 200 data to its own", async () => {
    const b = await cookieFor("owner@pellham.example");
    const thrown = await Promise.resolve(unitLoader(routeArgs(requestWith(b.cookie, `/equipment/${unitA}`), { unitId: unitA }))).then(
      () => null,
      (e: unknown) => e,
    );
    expect(thrown).toBeInstanceOf(Response);
    expect((thrown as Response).status).toBe(404);

    const a = await cookieFor("tech@tinderbox.example");
    const own = await unitLoader(routeArgs(requestWith(a.cookie, `/equipment/${unitA}`), { unitId: unitA }));
    expect(own.unit.id).toBe(unitA);
  });
});
