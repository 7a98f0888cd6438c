// Calls, customers, sites, units and meters: forms validated with zod (errors beside the fields),
// search and filters, and every record kept inside its shop.
import { afterAll, describe, expect, it } from "vitest";
import { DEMO_SHOP, OTHER_SHOP } from "../../db/demo";
import { stableId } from "../../db/seed";
import type { Ctx } from "../../app/lib/context";
import { closeDb } from "../../app/lib/db.server";
import { createCall, getCall, listCalls, myCalls, suggestTrees } from "../../app/models/calls.server";
import { createCustomer, createSite, createUnit, getUnit, listCustomers, searchUnits, updateUnit } from "../../app/models/equipment.server";
import { createMeter, listMeters, meterInput } from "../../app/models/meters.server";
import { action as callFormAction } from "../../app/routes/calls.new";
import { loader as callLoader } from "../../app/routes/calls.$callId";
import { action as metersAction } from "../../app/routes/meters._index";
import { cookieFor, requestWith, routeArgs } from "../support/session";

afterAll(() => closeDb());

const shopA = stableId(DEMO_SHOP.key);
const shopB = stableId(OTHER_SHOP.key);
const lead: Ctx = { shopId: shopA, userId: stableId("user:lead@tinderbox.example"), role: "lead" };
const tech: Ctx = { shopId: shopA, userId: stableId("user:tech@tinderbox.example"), role: "technician" };
const otherOwner: Ctx = { shopId: shopB, userId: stableId("user:owner@pellham.example"), role: "owner" };
const rotisserie = stableId("unit:larkspur-rotisserie");

const form = (fields: Record<string, string>) => {
  const f = new FormData();
  for (const [k, v] of Object.entries(fields)) f.set(k, v);
  return f;
};

async function thrown(p: unknown): Promise<Response> {
  try {
    const r = await p;
    return r as Response;
  } catch (e) {
    return e as Response;
  }
}

describe("the call form", () => {
  it("an empty symptom and no unit come back with an error beside each field and what was typed", async () => {
    const { cookie } = await cookieFor("lead@tinderbox.example");
    const res = (await callFormAction(
      routeArgs(
        requestWith(cookie, "/calls/new", {
          method: "POST",
          body: form({ unitId: "", symptom: "", priority: "high", assignedTo: "", notes: "left side pale" }),
        }),
      ),
    )) as unknown as {
      data: { values: Record<string, string>; errors: Record<string, string> };
      init: { status: number };
    };
    expect(res.init.status).toBe(400);
    expect(res.data.errors.unitId).toBe("Choose the unit the call is about.");
    expect(res.data.errors.symptom).toBe("Say what the customer reported, in a few words.");
    expect(res.data.values.notes).toBe("left side pale");
  });

  it("a valid call is opened with the shop's next number and lands on its page; the other shop gets a 404 there", async () => {
    const { cookie } = await cookieFor("lead@tinderbox.example");
    const res = await thrown(
      callFormAction(
        routeArgs(
          requestWith(cookie, "/calls/new", {
            method: "POST",
            body: form({ unitId: rotisserie, symptom: "door gasket torn", priority: "low", assignedTo: tech.userId, notes: "" }),
          }),
        ),
      ),
    );
    expect(res.status).toBe(302);
    const callId = res.headers.get("location")!.split("/").pop()!;
    const call = await getCall(lead, callId);
    expect(call.call).toMatchObject({ symptom: "door gasket torn", priority: "low", status: "open", assignedTo: tech.userId, notes: null });
    expect(call.call.number).toBeGreaterThan(1000);
    const b = await cookieFor("owner@pellham.example");
    expect((await thrown(callLoader(routeArgs(requestWith(b.cookie, `/calls/${callId}`), { callId })))).status).toBe(404);
    expect((await myCalls(tech)).some((c) => c.id === callId)).toBe(true);
  });

  it("search finds calls by number and words; filters narrow by priority and assignee", async () => {
    const made = await createCall(lead, {
      unitId: rotisserie,
      symptom: "spit motor grinding noise",
      priority: "urgent",
      assignedTo: null,
      notes: null,
    });
    expect((await listCalls(lead, { q: String(made.number), status: "active" })).map((c) => c.id)).toEqual([made.id]);
    expect((await listCalls(lead, { q: "grinding" })).map((c) => c.id)).toContain(made.id);
    expect((await listCalls(lead, { priority: "urgent", assigned: "unassigned" })).map((c) => c.id)).toContain(made.id);
    expect((await listCalls(lead, { assigned: "me" })).map((c) => c.id)).not.toContain(made.id);
    expect((await listCalls(otherOwner, { q: "grinding" })).map((c) => c.id)).not.toContain(made.id);
  });

  it("suggests the unit's category first, the tree sharing the reported words on top", async () => {
    const list = await suggestTrees(
      lead,
      { category: "rotisserie", make: "Vantor", model: "RCF-2208 two-fan convection rotisserie" },
      "heats unevenly",
    );
    expect(list[0]).toMatchObject({ title: "Two-fan convection rotisserie heats unevenly", sameCategory: true, fits: true });
    expect(list[0]!.score).toBeGreaterThanOrEqual(2);
    expect(list.findIndex((t) => !t.sameCategory)).toBeGreaterThan(0);
  });

  // Issue 10, item 12. The starter library has one oven tree, written for electric convection
  // ovens; the demo's Hollin Street oven is an electric deck oven (db/demo.ts). A deck oven heats
  // from elements under a stone or steel deck with no fan, so the convection tree's fan and airflow
  // checks do not apply (common practice in the trade).
  it("does not offer the convection-oven tree as the best match for a deck oven, though the symptom words match", async () => {
    const deck = (await getUnit(lead, stableId("unit:hollin-oven"))).unit;
    expect(deck.model).toMatch(/deck oven/);
    const list = await suggestTrees(lead, deck, "slow to preheat, takes much longer to reach temperature");
    const convection = list.find((t) => t.title === "Electric convection oven slow to preheat")!;
    expect(convection).toMatchObject({ sameCategory: true, fits: false, otherKind: "convection, not deck" });
    expect(convection.score).toBeGreaterThan(0);
    expect(list.filter((t) => t.fits)).toEqual([]);
    // The same words on a convection oven: the tree fits, first.
    const conv = await suggestTrees(
      lead,
      { category: "oven", make: "Brenmoor", model: "CO-10 electric convection oven" },
      "slow to preheat",
    );
    expect(conv[0]).toMatchObject({ title: "Electric convection oven slow to preheat", fits: true, kindsShared: 2 });
  });
});

describe("customers, sites and units", () => {
  it("are created and edited in the caller's shop only; a site or unit can't hang off another shop's record", async () => {
    const tag = crypto.randomUUID().slice(0, 6);
    const name = `Quarry Lane Bakery ${tag}`;
    const serial = `QL-${tag}`;
    const customerId = await createCustomer(lead, { name, phone: null });
    await expect(
      createSite(otherOwner, customerId, {
        name: "Back kitchen",
        address: "1 Mill Row",
        contactName: "A. Person",
        contactEmail: "a@bakery.example",
      }),
    ).rejects.toMatchObject({ kind: "not-found" });
    const siteId = await createSite(lead, customerId, {
      name: "Back kitchen",
      address: "1 Mill Row",
      contactName: "A. Person",
      contactEmail: "a@bakery.example",
    });
    await expect(
      createUnit(otherOwner, siteId, { category: "oven", make: "Brenmoor", model: "EO-4", serial: "X1", installedOn: null }),
    ).rejects.toMatchObject({ kind: "not-found" });
    const unitId = await createUnit(lead, siteId, {
      category: "oven",
      make: "Brenmoor",
      model: "EO-4",
      serial: "X1",
      installedOn: "2023-02-01",
    });
    await expect(
      updateUnit(otherOwner, unitId, { category: "oven", make: "x", model: "x", serial: "x", installedOn: null }),
    ).rejects.toMatchObject({ kind: "not-found" });
    await updateUnit(lead, unitId, { category: "oven", make: "Brenmoor", model: "EO-4", serial, installedOn: "2023-02-01" });
    expect((await getUnit(lead, unitId)).unit.serial).toBe(serial);
    expect((await listCustomers(lead, "Quarry Lane Bakery")).map((c) => [c.name, c.sites])).toContainEqual([name, 1]);
    expect((await listCustomers(lead, "1 Mill Row")).map((c) => c.id)).toContain(customerId);
    expect((await listCustomers(lead, "Back kitchen")).map((c) => c.id)).toContain(customerId);
    expect((await listCustomers(otherOwner, name)).length).toBe(0);
    expect((await searchUnits(lead, { q: serial, category: "oven" })).map((u) => u.id)).toEqual([unitId]);
    expect((await searchUnits(lead, { q: serial, category: "fryer" })).length).toBe(0);
  });
});

describe("meters", () => {
  it("a unit that doesn't measure the chosen quantity, a missing accuracy and a resolution coarser than the range are refused beside their fields", () => {
    const wrongUnit = meterInput.safeParse({
      name: "Clamp",
      quantity: "current",
      unit: "V",
      rangeMax: "400",
      resolution: "0.1",
      percent: "2",
      counts: "3",
    });
    expect(wrongUnit.error?.issues.map((i) => [i.path.join("."), i.message])).toEqual([
      ["unit", "“V” isn't a unit of a current; try A, mA, µA."],
    ]);
    const missing = meterInput.safeParse({
      name: "Clamp",
      quantity: "current",
      unit: "A",
      rangeMax: "400",
      resolution: "0.1",
      percent: "",
      counts: "3",
    });
    expect(missing.error?.issues.map((i) => [i.path.join("."), i.message])).toEqual([["percent", "Enter the % of reading as a number."]]);
    const coarse = meterInput.safeParse({
      name: "Odd",
      quantity: "voltage",
      unit: "V",
      rangeMax: "2",
      resolution: "5",
      percent: "1",
      counts: "1",
    });
    expect(coarse.error?.issues[0]?.path).toEqual(["resolution"]);
  });

  it("leads add meters; technicians can't (403); the list is per shop", async () => {
    const id = await createMeter(lead, {
      name: `Bench clamp ${crypto.randomUUID().slice(0, 4)}`,
      quantity: "current",
      unit: "A",
      rangeMax: 400,
      resolution: 0.1,
      percent: 2,
      counts: 5,
    });
    expect((await listMeters(lead)).map((m) => m.id)).toContain(id);
    expect((await listMeters(otherOwner)).map((m) => m.id)).not.toContain(id);
    const t = await cookieFor("tech@tinderbox.example");
    const res = await thrown(
      metersAction(
        routeArgs(
          requestWith(t.cookie, "/meters", {
            method: "POST",
            body: form({ name: "x", quantity: "voltage", unit: "V", rangeMax: "1", resolution: "0.1", percent: "1", counts: "1" }),
          }),
        ),
      ),
    );
    expect(res.status).toBe(403);
  });
});
