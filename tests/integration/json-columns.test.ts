import { eq } from "drizzle-orm";
import { afterAll, describe, expect, it } from "vitest";
import { customers, equipmentUnits, shops, sites } from "../../db/schema";
import { closeDb, db, pool } from "../../app/lib/db.server";

afterAll(() => closeDb());

describe("JSON columns on MariaDB", () => {
  it("round-trip nested objects (stored as LONGTEXT with a json_valid CHECK, read back as objects)", async () => {
    const shopId = crypto.randomUUID();
    const settings = { timeZone: "America/Denver", reportFooter: "Thanks — “quoted” & ünïcode ✓" };
    await db().insert(shops).values({ id: shopId, name: "JSON test shop", town: "Nowhere", settings });
    const [row] = await db().select().from(shops).where(eq(shops.id, shopId));
    expect(typeof row!.settings).toBe("object");
    expect(row!.settings).toEqual(settings);

    const customerId = crypto.randomUUID();
    const siteId = crypto.randomUUID();
    const unitId = crypto.randomUUID();
    await db().insert(customers).values({ id: customerId, shopId, name: "C" });
    await db()
      .insert(sites)
      .values({ id: siteId, shopId, customerId, name: "S", address: "A", contactName: "N", contactEmail: "n@x.example" });
    const nameplate = { supply: { value: 208, unit: "V" }, fanCapacitor: { value: 1.5, unit: "µF" } };
    await db()
      .insert(equipmentUnits)
      .values({ id: unitId, shopId, siteId, category: "rotisserie", make: "M", model: "X", serial: "1", nameplate });
    const [unit] = await db().select().from(equipmentUnits).where(eq(equipmentUnits.id, unitId));
    expect(unit!.nameplate).toEqual(nameplate);
    expect(unit!.nameplate.fanCapacitor?.value).toBe(1.5);
  });

  it("the database itself refuses text that is not JSON (the CHECK constraint holds)", async () => {
    await expect(
      pool().query("INSERT INTO shops (id, name, town, settings, created_at) VALUES (?, 'Bad', 'X', 'not json', NOW(3))", [
        crypto.randomUUID(),
      ]),
    ).rejects.toThrow(/CONSTRAINT|check/i);
  });
});
