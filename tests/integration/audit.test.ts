// The audit trail (issue 9 item 13): each recorded action, done through its route as a browser or
// the phone would, leaves one entry in the same transaction — who, when, what and from which address
// — and a refused action leaves none. The owner's /audit page shows the shop's own entries only,
// newest first, filtered and paged; nothing in the app changes or removes an entry.
import { readdirSync, readFileSync, statSync } from "node:fs";
import { join } from "node:path";
import { and, desc, eq, isNull } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { auditEvents, invitations, type AuditAction } from "../../db/schema";
import { recordAudit } from "../../app/lib/audit.server";
import { closeDb, db } from "../../app/lib/db.server";
import { createCall } from "../../app/models/calls.server";
import { changeRunStatus, recordOutcome } from "../../app/models/runs/lifecycle.server";
import { startRun } from "../../app/models/runs/start.server";
import { postStep } from "../../app/models/runs/steps.server";
import { createDraftTree } from "../../app/models/trees/drafts.server";
import { publishDraft } from "../../app/models/trees/publish.server";
import * as auditPage from "../../app/routes/audit";
import * as escalationsPage from "../../app/routes/escalations";
import * as invitePage from "../../app/routes/invite.$token";
import * as loginPage from "../../app/routes/login";
import * as peoplePage from "../../app/routes/people";
import * as sendReportApi from "../../app/routes/api.reports.$reportId.send";
import * as treeEdit from "../../app/routes/trees.$treeId.edit";
import * as treePage from "../../app/routes/trees.$treeId";
import { cookieFor, requestWith, routeArgs } from "../support/session";
import { FRESH_PASSWORD, freshShop, type FreshShop } from "../support/shops";
import { smallTree } from "../support/trees";

afterAll(() => closeDb());

// Addresses from the documentation ranges (RFC 5737 TEST-NET-2 and TEST-NET-3).
const FROM = { clientAddress: "198.51.100.23" };
const ELSEWHERE = { clientAddress: "203.0.113.9" };

let a: FreshShop;
let b: FreshShop;
const cookies: Record<string, string> = {};

beforeAll(async () => {
  [a, b] = await Promise.all([freshShop(), freshShop()]);
  for (const [key, email] of [
    ["owner", a.people.owner.email],
    ["lead", a.people.lead.email],
    ["tech", a.people.technician.email],
    ["otherOwner", b.people.owner.email],
  ] as const) {
    cookies[key] = (await cookieFor(email)).cookie;
  }
});

async function entries(shopId: string | null, action?: AuditAction) {
  return db()
    .select()
    .from(auditEvents)
    .where(
      and(
        shopId === null ? isNull(auditEvents.shopId) : eq(auditEvents.shopId, shopId),
        action ? eq(auditEvents.action, action) : undefined,
      ),
    )
    .orderBy(desc(auditEvents.id));
}

/** A route's answer, whether returned or thrown (redirects are thrown by some actions). */
async function answer(p: unknown): Promise<unknown> {
  try {
    return await p;
  } catch (e) {
    return e;
  }
}

const post = (cookie: string, path: string, fields: Record<string, string>) =>
  requestWith(cookie, path, { method: "POST", body: new URLSearchParams(fields) });

async function publishedTree(title = `Audit tree ${crypto.randomUUID().slice(0, 6)}`) {
  const { treeId } = await createDraftTree(a.people.lead, smallTree(title));
  return { treeId, title };
}

describe("versions published and retired", () => {
  it("publishing through the editor records the publisher, the version and the address; a refused publish records nothing", async () => {
    const broken = smallTree(`Broken ${crypto.randomUUID().slice(0, 6)}`);
    broken.nodes = broken.nodes.filter((n) => n.id !== "motor-failed");
    const { treeId: brokenId } = await createDraftTree(a.people.lead, broken);
    const refused = (await answer(
      treeEdit.action(
        routeArgs(
          post(cookies.lead!, `/trees/${brokenId}/edit`, { intent: "publish", revision: "1", changeNote: "First" }),
          { treeId: brokenId },
          FROM,
        ),
      ),
    )) as {
      init: { status: number };
    };
    expect(refused.init.status).toBe(422);
    expect((await entries(a.shopId, "version.published")).filter((e) => (e.details as { treeId?: string }).treeId === brokenId)).toEqual(
      [],
    );

    const { treeId, title } = await publishedTree();
    const ok = (await answer(
      treeEdit.action(
        routeArgs(
          post(cookies.lead!, `/trees/${treeId}/edit`, { intent: "publish", revision: "1", changeNote: "First cut" }),
          { treeId },
          FROM,
        ),
      ),
    )) as Response;
    expect(ok.status).toBe(302);
    const [entry] = (await entries(a.shopId, "version.published")).filter((e) => (e.details as { treeId?: string }).treeId === treeId);
    expect(entry).toMatchObject({
      actorId: a.people.lead.userId,
      address: FROM.clientAddress,
      subjectType: "tree-version",
      summary: `Published ‘${title}’ version 1`,
      details: { treeId, number: 1, changeNote: "First cut" },
    });
    expect(Date.now() - entry!.at.getTime()).toBeLessThan(60_000);
  });

  it("retiring through the tree page records who retired which version", async () => {
    const { treeId, title } = await publishedTree();
    await publishDraft(a.people.lead, treeId, 1, "First");
    await answer(
      treePage.action(routeArgs(post(cookies.owner!, `/trees/${treeId}`, { intent: "retire", number: "1" }), { treeId }, ELSEWHERE)),
    );
    const [entry] = (await entries(a.shopId, "version.retired")).filter((e) => (e.details as { treeId?: string }).treeId === treeId);
    expect(entry).toMatchObject({
      actorId: a.people.owner.userId,
      address: ELSEWHERE.clientAddress,
      summary: `Retired ‘${title}’ version 1`,
    });
  });
});

describe("invitations sent, accepted and withdrawn", () => {
  it("the owner's invitation, the newcomer accepting it, and a withdrawn one are each recorded", async () => {
    const email = `newcomer.${crypto.randomUUID().slice(0, 6)}@wrenfield.example`;
    const invited = (await answer(
      peoplePage.action(routeArgs(post(cookies.owner!, "/people", { intent: "invite", email, role: "technician" }), {}, FROM)),
    )) as { ok: boolean; link: string };
    expect(invited.ok).toBe(true);
    const [sent] = await entries(a.shopId, "invitation.sent");
    expect(sent).toMatchObject({
      actorId: a.people.owner.userId,
      address: FROM.clientAddress,
      subjectType: "invitation",
      summary: `Invited ${email} as Technician`,
    });

    const token = invited.link.split("/invite/")[1]!;
    const joined = (await answer(
      invitePage.action(
        routeArgs(
          new Request(`http://localhost/invite/${token}`, {
            method: "POST",
            body: new URLSearchParams({ name: "Nell Ashby", password: FRESH_PASSWORD }),
          }),
          { token },
          ELSEWHERE,
        ),
      ),
    )) as Response;
    expect(joined.status).toBe(302);
    const [accepted] = await entries(a.shopId, "invitation.accepted");
    expect(accepted).toMatchObject({
      actorEmail: email,
      address: ELSEWHERE.clientAddress,
      subjectId: sent!.subjectId,
      details: { role: "technician", newAccount: true },
    });
    expect(accepted!.actorId).not.toBeNull();

    const other = `later.${crypto.randomUUID().slice(0, 6)}@wrenfield.example`;
    await answer(peoplePage.action(routeArgs(post(cookies.owner!, "/people", { intent: "invite", email: other, role: "lead" }), {}, FROM)));
    const [inv] = await db().select().from(invitations).where(eq(invitations.email, other));
    await answer(peoplePage.action(routeArgs(post(cookies.owner!, "/people", { intent: "revoke", id: inv!.id }), {}, FROM)));
    const [withdrawn] = await entries(a.shopId, "invitation.withdrawn");
    expect(withdrawn).toMatchObject({ actorId: a.people.owner.userId, subjectId: inv!.id, summary: `Withdrew the invitation of ${other}` });
    // Withdrawing it again is refused and records nothing more.
    const again = (await answer(
      peoplePage.action(routeArgs(post(cookies.owner!, "/people", { intent: "revoke", id: inv!.id }), {}, FROM)),
    )) as Response;
    expect(again.status).toBe(404);
    expect(await entries(a.shopId, "invitation.withdrawn")).toHaveLength(1);
  });
});

describe("take-overs and reports sent", () => {
  async function runOnCall() {
    const { treeId } = await publishedTree();
    await publishDraft(a.people.lead, treeId, 1, "First");
    const call = await createCall(a.people.lead, {
      unitId: a.unitId,
      symptom: "fryer won't heat",
      priority: "high",
      assignedTo: a.people.technician.userId,
      notes: null,
    });
    const { runId } = await startRun(a.people.technician, { treeId, callId: call.id });
    return { runId, call };
  }

  it("a lead taking over an escalated run is recorded with whose run it was and the call", async () => {
    const { runId, call } = await runOnCall();
    await changeRunStatus(a.people.technician, runId, { action: "escalate", reason: "Burnt smell at the element terminals." });
    const res = (await answer(escalationsPage.action(routeArgs(post(cookies.lead!, "/escalations", { runId }), {}, FROM)))) as Response;
    expect(res.status).toBe(302);
    const [entry] = await entries(a.shopId, "run.taken-over");
    expect(entry).toMatchObject({
      actorId: a.people.lead.userId,
      address: FROM.clientAddress,
      subjectType: "run",
      subjectId: runId,
      summary: `Took over ${a.people.technician.name}'s run on call ${call.number}`,
    });
  });

  it("e-mailing a report is recorded with the number and the recipient; sending again at once is refused (429) and records nothing", async () => {
    const { runId } = await runOnCall();
    await postStep(a.people.technician, runId, { key: crypto.randomUUID(), entry: { type: "answer", node: "cap-look", answer: "yes" } });
    const { reportId, number } = await recordOutcome(a.people.technician, runId, {
      action: "Replaced the run capacitor.",
      minutes: 25,
      parts: [],
    });
    const send = () =>
      sendReportApi.action(
        routeArgs(
          requestWith(cookies.tech!, `/api/reports/${reportId}/send`, { method: "POST", headers: { origin: "http://localhost" } }),
          { reportId },
          FROM,
        ),
      ) as Promise<Response>;
    expect((await send()).status).toBe(200);
    const [entry] = await entries(a.shopId, "report.sent");
    expect(entry).toMatchObject({
      actorId: a.people.technician.userId,
      address: FROM.clientAddress,
      subjectType: "report",
      subjectId: reportId,
      details: { number, to: expect.stringMatching(/@wrenfield\.example$/) },
    });
    const again = await send();
    expect(again.status).toBe(429);
    expect(await again.json()).toMatchObject({ error: expect.stringMatching(/can be sent again in \d+ minutes?/), code: "sent-recently" });
    expect(await entries(a.shopId, "report.sent")).toHaveLength(1);
  });
});

describe("sign-ins and refused sign-ins", () => {
  const login = (email: string, password: string, context = FROM) =>
    answer(
      loginPage.action(
        routeArgs(new Request("http://localhost/login", { method: "POST", body: new URLSearchParams({ email, password }) }), {}, context),
      ),
    );

  it("a sign-in is recorded in the account's shop with its address", async () => {
    const res = (await login(a.people.trainer.email, FRESH_PASSWORD)) as Response;
    expect(res.status).toBe(302);
    const [entry] = (await entries(a.shopId, "sign-in.succeeded")).filter((e) => e.actorId === a.people.trainer.userId);
    expect(entry).toMatchObject({ actorEmail: a.people.trainer.email, address: FROM.clientAddress, subjectType: "user" });
  });

  it("a wrong password is recorded in every shop of the account; an unknown e-mail in no shop", async () => {
    // The lead of shop A also joins shop B: a refused sign-in belongs to both.
    const { memberships } = await import("../../db/schema");
    await db().insert(memberships).values({ shopId: b.shopId, userId: a.people.lead.userId, role: "trainer" });
    const res = (await login(a.people.lead.email, "not-the-password-at-all", ELSEWHERE)) as { init: { status: number } };
    expect(res.init.status).toBe(401);
    for (const shopId of [a.shopId, b.shopId]) {
      const [entry] = (await entries(shopId, "sign-in.refused")).filter((e) => e.subjectId === a.people.lead.userId);
      expect(entry, shopId).toMatchObject({
        actorId: null,
        actorEmail: a.people.lead.email,
        address: ELSEWHERE.clientAddress,
        details: { reason: "wrong password" },
      });
    }
    const nobody = `nobody.${crypto.randomUUID().slice(0, 6)}@wrenfield.example`;
    await login(nobody, "whatever-it-is-here", ELSEWHERE);
    const unknown = (await entries(null, "sign-in.refused")).filter((e) => e.actorEmail === nobody);
    expect(unknown).toHaveLength(1);
    expect(unknown[0]).toMatchObject({ shopId: null, address: ELSEWHERE.clientAddress, details: { reason: "unknown e-mail" } });
  });
});

describe("the owner's /audit page", () => {
  type Page = {
    entries: { id: number; summary: string; action: string; who: string; address: string | null }[];
    nextBefore: number | null;
    people: { id: string }[];
  };
  const load = async (cookie: string, query = "") =>
    (await auditPage.loader(routeArgs(requestWith(cookie, `/audit${query}`)))) as unknown as Page;

  it("shows the owner's own shop only, newest first, and filters by action, person and period", async () => {
    const mine = await load(cookies.owner!);
    expect(mine.entries.length).toBeGreaterThan(3);
    const ids = mine.entries.map((e) => e.id);
    expect(ids).toEqual([...ids].sort((x, y) => y - x));
    const ownIds = new Set((await entries(a.shopId)).map((e) => e.id));
    for (const e of mine.entries) expect(ownIds.has(e.id), e.summary).toBe(true);
    // Shop B's owner sees none of shop A's entries.
    const theirs = await load(cookies.otherOwner!);
    for (const e of theirs.entries) expect(ownIds.has(e.id), e.summary).toBe(false);

    const published = await load(cookies.owner!, "?action=version.published");
    expect(published.entries.length).toBeGreaterThan(0);
    expect(new Set(published.entries.map((e) => e.action))).toEqual(new Set(["Version published"]));
    const byOwner = await load(cookies.owner!, `?person=${a.people.owner.userId}`);
    expect(byOwner.entries.length).toBeGreaterThan(0);
    for (const e of byOwner.entries) expect(e.who).toBe(a.people.owner.name);
    const today = new Date().toISOString().slice(0, 10);
    expect((await load(cookies.owner!, `?from=${today}&to=${today}`)).entries.length).toBe(mine.entries.length);
    expect((await load(cookies.owner!, "?to=2000-01-01")).entries).toEqual([]);
    // Unreadable filters are not applied (never a 500).
    expect((await load(cookies.owner!, "?action=drop-table&person=x&from=yesterday&before=-4")).entries.length).toBe(mine.entries.length);
  });

  it("pages a long trail: each page newest first, no entry twice, none skipped", async () => {
    // More than two pages' worth, written by the trail's own writer.
    for (let i = 0; i < 110; i++)
      await recordAudit({
        shopId: a.shopId,
        actorId: a.people.lead.userId,
        action: "sign-in.succeeded",
        summary: `Sign-in ${i} for paging`,
        address: FROM.clientAddress,
      });
    const all = await entries(a.shopId);
    const seen: number[] = [];
    let query = "";
    for (let pageNo = 0; pageNo < 20; pageNo++) {
      const p = (await auditPage.loader(routeArgs(requestWith(cookies.owner!, `/audit${query}`)))) as unknown as Page;
      seen.push(...p.entries.map((e) => e.id));
      if (p.nextBefore === null) break;
      query = `?before=${p.nextBefore}`;
    }
    expect(seen).toEqual(all.map((e) => e.id));
  });

  it("is the owner's: other roles are refused, and it takes no POST", async () => {
    for (const who of ["lead", "tech"] as const) {
      const res = (await answer(auditPage.loader(routeArgs(requestWith(cookies[who]!, "/audit"))))) as Response;
      expect(res.status, who).toBe(403);
    }
    expect("action" in auditPage).toBe(false);
  });

  it("nothing in the app updates or deletes an audit entry: the table is only ever inserted into and read", () => {
    const offenders: string[] = [];
    const walk = (dir: string) => {
      for (const name of readdirSync(dir)) {
        const path = join(dir, name);
        if (statSync(path).isDirectory()) walk(path);
        else if (/\.(ts|tsx)$/.test(name)) {
          const text = readFileSync(path, "utf8");
          if (/\.(update|delete)\(\s*auditEvents\b/.test(text) || /(UPDATE|DELETE\s+FROM)\s+`?audit_events/i.test(text))
            offenders.push(path);
        }
      }
    };
    walk("app");
    expect(offenders).toEqual([]);
  });
});
