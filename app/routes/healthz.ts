import { databaseIsUp } from "~/lib/db.server";

export async function loader() {
  const up = await databaseIsUp();
  return Response.json({ ok: up, db: up ? "up" : "down" }, { status: up ? 200 : 503, headers: { "cache-control": "no-store" } });
}
