// Who may do what, end to end: every exported model function is called by each of the four roles
// of one shop (technician, lead, trainer, owner), and allowed or refused as the policy table in
// app/lib/policy.ts says. A refused call is a `forbidden` Refusal with the rule's own words and
// changes no row. New model function? Add a row below; the last test fails until every exported
// model function has one.
import { count, getTableName, is } from "drizzle-orm";
import { MySqlTable } from "drizzle-orm/mysql-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import * as schema from "../../db/schema";
import { stableId } from "../../db/seed";
import { serializeTree } from "../../app/engine/markdown/serialize";
import { reportMailHtml } from "../../app/components/report/reportMail";
import type { Ctx } from "../../app/lib/context";
import { parseFilters } from "../../app/lib/insights/filters";
import { closeDb, db } from "../../app/lib/db.server";
import { can, POLICY, type Action } from "../../app/lib/policy";
import { DEMO_PASSWORD } from "../../db/demo";
import * as account from "../../app/models/account.server";
import * as audit from "../../app/models/audit.server";
import * as calls from "../../app/models/calls.server";
import * as equipment from "../../app/models/equipment.server";
import * as foundHere from "../../app/models/insights/found-here.server";
import * as insights from "../../app/models/insights/overview.server";
import * as members from "../../app/models/members.server";
import * as meters from "../../app/models/meters.server";
import * as outbox from "../../app/models/outbox.server";
import * as passwordReset from "../../app/models/password-reset.server";
import * as people from "../../app/models/people.server";
import * as kit from "../../app/models/runs/kit.server";
import * as lifecycle from "../../app/models/runs/lifecycle.server";
import * as notes from "../../app/models/runs/notes.server";
import * as photos from "../../app/models/runs/photos.server";
import * as queries from "../../app/models/runs/queries.server";
import * as reports from "../../app/models/runs/reports.server";
import * as start from "../../app/models/runs/start.server";
import * as steps from "../../app/models/runs/steps.server";
import * as view from "../../app/models/runs/view.server";
import * as shop from "../../app/models/shop.server";
import * as drafts from "../../app/models/trees/drafts.server";
import * as editor from "../../app/models/trees/editor.server";
import * as images from "../../app/models/trees/images.server";
import * as library from "../../app/models/trees/library.server";
import * as publish from "../../app/models/trees/publish.server";
import * as transfer from "../../app/models/trees/transfer.server";
import * as versions from "../../app/models/trees/versions.server";
import * as practice from "../../app/models/training/practice.server";
import * as reviews from "../../app/models/training/reviews.server";
import * as scenarios from "../../app/models/training/scenarios.server";
import * as summary from "../../app/models/training/summary.server";
import { assigned, newScenario, scenarioFields, smallPracticeAtEnd, SMALL_WORLD } from "../support/training";
import { address, newPerson } from "../support/accounts";
import { TINY_PNG } from "../support/photo";
import { smallTree } from "../support/trees";

afterAll(() => closeDb());

const shopId = stableId("shop:tinderbox");
const as = (email: string, role: Ctx["role"]): Ctx => ({ shopId, userId: stableId(`user:${email}`), role });
const tech = as("tech@tinderbox.example", "technician");
const lead = as("lead@tinderbox.example", "lead");
const trainer = as("trainer@tinderbox.example", "trainer");
const owner = as("owner@tinderbox.example", "owner");
const ROLES = [tech, lead, trainer, owner];

const customerId = stableId("cust:larkspur");
const siteId = stableId("site:larkspur-deli");
const unitId = stableId("unit:larkspur-rotisserie");
const tag = () => crypto.randomUUID().slice(0, 8);

// --- fixtures, made by someone allowed (the technician holds every run) ---------------------------

let publishedTreeId: string;
beforeAll(async () => {
  ({ treeId: publishedTreeId } = await drafts.createPublishedTree(lead, smallTree(`Authorisation ${tag()}`), "For the authorisation test"));
});

const newCall = async () =>
  (await calls.createCall(lead, { unitId, symptom: "fan hums", priority: "normal", assignedTo: tech.userId, notes: null })).id;
const newRun = async (callId?: string) => (await start.startRun(tech, { treeId: publishedTreeId, callId })).runId;
const step = () => ({ key: crypto.randomUUID(), entry: { type: "answer" as const, node: "cap-look", answer: "no" } });
const runAtOutcome = async () => {
  const runId = await newRun(await newCall());
  // "yes, bulging" leads straight to the failed-capacitor outcome of the small tree.
  await steps.postStep(tech, runId, { key: crypto.randomUUID(), entry: { type: "answer", node: "cap-look", answer: "yes" } });
  return runId;
};
const report = async () =>
  (await lifecycle.recordOutcome(tech, await runAtOutcome(), { action: "Replaced the capacitor.", minutes: 30, parts: [] })).reportId;
const runWithPhoto = async () => {
  const runId = await newRun();
  return { runId, photoId: (await photos.addPhoto(tech, runId, { key: crypto.randomUUID(), node: "cap-look", bytes: TINY_PNG })).photo.id };
};
const draftTree = () => drafts.createDraftTree(lead, smallTree(`Draft ${tag()}`));
const publishedTree = async () => {
  const { treeId, versionId } = await draftTree();
  await publish.publishDraft(lead, treeId, 1, "First");
  return { treeId, versionId };
};
const publishedWithDraft = async () => {
  const t = await publishedTree();
  return { ...t, draftId: (await drafts.startDraft(lead, t.treeId)).versionId };
};
// Practice on the small tree: a scenario (the trainer writes it), one assigned to the technician, a
// practice run of theirs at its end, and one finished.
const scenario = () => newScenario(trainer, publishedTreeId, "cap-failed", SMALL_WORLD);
const assignment = async () => assigned(trainer, tech, await scenario());
const practiceAtEnd = () => smallPracticeAtEnd(trainer, tech, publishedTreeId);
const practiceDone = async () => {
  const p = await practiceAtEnd();
  await practice.finishPractice(tech, p.runId);
  return p;
};
const meterInput = {
  name: `Bench meter ${tag()}`,
  quantity: "voltage" as const,
  unit: "V",
  rangeMax: 600,
  resolution: 0.1,
  percent: 1,
  counts: 3,
};
const site = { name: "Back kitchen", address: "1 Mill Row", contactName: "A. Person", contactEmail: "a@bakery.example" };
const unit = { category: "oven" as const, make: "Brenmoor", model: "EO-4", serial: "X1", installedOn: null };
const nothing = async () => undefined;

// --- the table: one row per model function (and per action, where one function checks several) ---

type Row = {
  fn: unknown;
  label: string;
  action: Action;
  /** The fixture's run is held by the technician: the policy's "holder" fact is true for them only. */
  heldByTechnician?: boolean;
  /** Makes what the call needs, then returns the call. */
  call: (ctx: Ctx) => Promise<() => Promise<unknown>>;
};

function row<A>(
  fn: unknown,
  action: Action,
  arrange: () => Promise<A>,
  act: (ctx: Ctx, a: A) => Promise<unknown>,
  opts: { label?: string; heldByTechnician?: boolean } = {},
): Row {
  const name = (fn as { name?: string }).name ?? "?";
  return {
    fn,
    action,
    label: opts.label ? `${name} (${opts.label})` : name,
    heldByTechnician: opts.heldByTechnician,
    call: async (ctx) => {
      const a = await arrange();
      return () => act(ctx, a);
    },
  };
}

const held = { heldByTechnician: true };

const ROWS: Row[] = [
  // calls
  row(calls.listCalls, "calls.view", nothing, (c) => calls.listCalls(c)),
  row(calls.myCalls, "calls.mine", nothing, (c) => calls.myCalls(c)),
  row(calls.recentlyDone, "calls.mine", nothing, (c) => calls.recentlyDone(c)),
  row(calls.getCall, "calls.view", newCall, (c, id) => calls.getCall(c, id)),
  row(calls.assignablePeople, "calls.view", nothing, (c) => calls.assignablePeople(c)),
  row(calls.callFormChoices, "calls.write", nothing, (c) => calls.callFormChoices(c)),
  row(calls.createCall, "calls.write", nothing, (c) =>
    calls.createCall(c, { unitId, symptom: "no heat", priority: "low", assignedTo: null, notes: null }),
  ),
  row(calls.updateCall, "calls.write", newCall, (c, id) =>
    calls.updateCall(c, id, { unitId, symptom: "no heat at all", priority: "high", assignedTo: null, notes: null, status: "open" }),
  ),
  row(calls.suggestTrees, "trees.view", nothing, (c) =>
    calls.suggestTrees(c, { category: "rotisserie", make: "Vantor", model: "RCF-2208" }, "fan hums"),
  ),
  row(calls.callsOfUnit, "calls.view", nothing, (c) => calls.callsOfUnit(c, unitId)),
  // customers, sites, units
  row(equipment.getCustomer, "equipment.view", nothing, (c) => equipment.getCustomer(c, customerId)),
  row(equipment.getSite, "equipment.view", nothing, (c) => equipment.getSite(c, siteId)),
  row(equipment.getUnit, "equipment.view", nothing, (c) => equipment.getUnit(c, unitId)),
  row(equipment.unitRatings, "equipment.view", nothing, (c) =>
    equipment.unitRatings(c, { category: "rotisserie", nameplate: { rated_uf: { value: 1.5, unit: "µF" } } }),
  ),
  row(equipment.listUnits, "equipment.view", nothing, (c) => equipment.listUnits(c)),
  row(equipment.searchUnits, "equipment.view", nothing, (c) => equipment.searchUnits(c, { q: "rotisserie" })),
  row(equipment.listCustomers, "equipment.view", nothing, (c) => equipment.listCustomers(c, "Larkspur")),
  row(equipment.sitesOf, "equipment.view", nothing, (c) => equipment.sitesOf(c, customerId)),
  row(equipment.getSiteWithCustomer, "equipment.view", nothing, (c) => equipment.getSiteWithCustomer(c, siteId)),
  row(equipment.unitsAt, "equipment.view", nothing, (c) => equipment.unitsAt(c, siteId)),
  row(equipment.shopCounts, "shop.overview", nothing, (c) => equipment.shopCounts(c)),
  // owner insights
  row(insights.overview, "shop.overview", nothing, (c) => insights.overview(c, parseFilters(new URLSearchParams("period=30")).filters)),
  row(insights.overviewTable, "shop.overview", nothing, (c) =>
    insights.overviewTable(c, parseFilters(new URLSearchParams("period=30")).filters, "parts"),
  ),
  row(insights.runQuery, "shop.overview", nothing, (c) =>
    insights.runQuery(c, "rootCauses", parseFilters(new URLSearchParams("period=30")).filters),
  ),
  row(insights.filterOptions, "shop.overview", nothing, (c) => insights.filterOptions(c, {})),
  row(foundHere.foundHereBefore, "runs.view", publishedTree, (c, t) => foundHere.foundHereBefore(c, { versionId: t.versionId })),
  row(equipment.createCustomer, "equipment.write", nothing, (c) =>
    equipment.createCustomer(c, { name: `Quarry Bakery ${tag()}`, phone: null }),
  ),
  row(
    equipment.updateCustomer,
    "equipment.write",
    () => equipment.createCustomer(lead, { name: `Mill Cafe ${tag()}`, phone: null }),
    (c, id) => equipment.updateCustomer(c, id, { name: "Mill Cafe", phone: "555-0100" }),
  ),
  row(
    equipment.createSite,
    "equipment.write",
    () => equipment.createCustomer(lead, { name: `Ford Diner ${tag()}`, phone: null }),
    (c, id) => equipment.createSite(c, id, site),
  ),
  row(
    equipment.updateSite,
    "equipment.write",
    async () => equipment.createSite(lead, await equipment.createCustomer(lead, { name: `Weir Inn ${tag()}`, phone: null }), site),
    (c, id) => equipment.updateSite(c, id, { ...site, name: "Front kitchen" }),
  ),
  row(equipment.createUnit, "equipment.write", nothing, (c) => equipment.createUnit(c, siteId, unit)),
  row(
    equipment.updateUnit,
    "equipment.write",
    () => equipment.createUnit(lead, siteId, unit),
    (c, id) => equipment.updateUnit(c, id, { ...unit, serial: "X2" }),
  ),
  // meters
  row(meters.listMeters, "meters.view", nothing, (c) => meters.listMeters(c)),
  row(
    meters.getMeter,
    "meters.view",
    () => meters.createMeter(lead, meterInput),
    (c, id) => meters.getMeter(c, id),
  ),
  row(meters.createMeter, "meters.manage", nothing, (c) => meters.createMeter(c, meterInput)),
  row(
    meters.updateMeter,
    "meters.manage",
    () => meters.createMeter(lead, meterInput),
    (c, id) => meters.updateMeter(c, id, { ...meterInput, percent: 0.5 }),
  ),
  row(
    meters.setMeterRetired,
    "meters.manage",
    () => meters.createMeter(lead, meterInput),
    (c, id) => meters.setMeterRetired(c, id, true),
  ),
  // the shop
  row(shop.shopTimeZone, "shop.view", nothing, (c) => shop.shopTimeZone(c)),
  row(outbox.listOutbox, "outbox.view", nothing, (c) => outbox.listOutbox(c)),
  row(audit.listAudit, "audit.view", nothing, (c) => audit.listAudit(c)),
  row(people.listMembers, "people.manage", nothing, (c) => people.listMembers(c)),
  row(people.listOpenInvitations, "people.manage", nothing, (c) => people.listOpenInvitations(c)),
  row(people.invite, "people.manage", nothing, (c) => people.invite(c, `new-${tag()}@tinderbox.example`, "technician")),
  row(people.sendInvitationMail, "people.manage", nothing, (c) =>
    people.sendInvitationMail(c, `new-${tag()}@tinderbox.example`, "trainer", "http://localhost/invite/x"),
  ),
  row(
    people.revokeInvitation,
    "people.manage",
    () => people.invite(owner, `w-${tag()}@tinderbox.example`, "lead"),
    (c, inv) => people.revokeInvitation(c, inv.id),
  ),
  row(
    members.setMemberRole,
    "people.manage",
    () => newPerson(shopId, "technician"),
    (c, p) => members.setMemberRole(c, p.ctx.userId, "lead"),
  ),
  row(
    members.setMemberActive,
    "people.manage",
    () => newPerson(shopId, "technician"),
    (c, p) => members.setMemberActive(c, p.ctx.userId, false),
  ),
  row(
    members.resetMemberSignIn,
    "people.manage",
    () => newPerson(shopId, "technician"),
    (c, p) => members.resetMemberSignIn(c, p.ctx.userId, (t) => `http://localhost/reset-password/${t}`),
  ),
  // everyone's own account (the demo people keep their names and passwords: each change is undone)
  row(account.getAccount, "account.self", nothing, (c) => account.getAccount(c, { sessionId: "none" })),
  row(account.renameSelf, "account.self", nothing, async (c) =>
    account.renameSelf(c, { name: (await account.getAccount(c, { sessionId: "none" })).name }),
  ),
  row(account.changePassword, "account.self", nothing, async (c) => {
    const caller = { sessionId: "none", address: address() };
    await account.changePassword(c, caller, { currentPassword: DEMO_PASSWORD, newPassword: "a passing pass phrase" });
    await account.changePassword(c, caller, { currentPassword: "a passing pass phrase", newPassword: DEMO_PASSWORD });
  }),
  row(account.endMySessions, "account.self", nothing, (c) =>
    account.endMySessions(c, { sessionId: "none", address: address() }, { allButThis: true }),
  ),
  // runs
  row(start.startRun, "runs.start", nothing, (c) => start.startRun(c, { treeId: publishedTreeId })),
  row(kit.fieldKit, "calls.mine", nothing, (c) => kit.fieldKit(c)),
  row(
    view.getRunView,
    "runs.view",
    () => newRun(),
    (c, runId) => view.getRunView(c, runId),
  ),
  row(
    steps.postStep,
    "runs.step",
    () => newRun(),
    (c, runId) => steps.postStep(c, runId, step()),
    held,
  ),
  row(
    notes.addNote,
    "runs.note",
    () => newRun(),
    (c, runId) => notes.addNote(c, runId, { key: crypto.randomUUID(), node: "cap-look", text: "Capacitor top is domed." }),
    held,
  ),
  row(
    photos.addPhoto,
    "runs.photo",
    () => newRun(),
    (c, runId) => photos.addPhoto(c, runId, { key: crypto.randomUUID(), node: "cap-look", bytes: TINY_PNG }),
    held,
  ),
  row(photos.deletePhoto, "runs.photo", runWithPhoto, (c, r) => photos.deletePhoto(c, r.photoId), held),
  row(photos.getPhotoFile, "runs.view", runWithPhoto, (c, r) => photos.getPhotoFile(c, r.photoId)),
  row(photos.photosWithBytes, "reports.view", runWithPhoto, (c, r) => photos.photosWithBytes(c, r.runId)),
  row(
    lifecycle.changeRunStatus,
    "runs.pause",
    () => newRun(),
    (c, runId) => lifecycle.changeRunStatus(c, runId, { action: "pause" }),
    { ...held, label: "pause" },
  ),
  row(
    lifecycle.changeRunStatus,
    "runs.pause",
    async () => {
      const runId = await newRun();
      await lifecycle.changeRunStatus(tech, runId, { action: "pause" });
      return runId;
    },
    (c, runId) => lifecycle.changeRunStatus(c, runId, { action: "resume" }),
    { ...held, label: "resume" },
  ),
  row(
    lifecycle.changeRunStatus,
    "runs.escalate",
    () => newRun(),
    (c, runId) => lifecycle.changeRunStatus(c, runId, { action: "escalate", reason: "Burnt smell at the terminal block." }),
    { ...held, label: "escalate" },
  ),
  row(
    lifecycle.changeRunStatus,
    "runs.abandon",
    () => newRun(),
    (c, runId) => lifecycle.changeRunStatus(c, runId, { action: "abandon", reason: "Customer cancelled the visit." }),
    { ...held, label: "abandon" },
  ),
  row(
    lifecycle.changeRunStatus,
    "runs.take-over",
    () => newRun(),
    (c, runId) => lifecycle.changeRunStatus(c, runId, { action: "take-over" }),
    { ...held, label: "take over" },
  ),
  row(
    lifecycle.recordOutcome,
    "runs.outcome",
    runAtOutcome,
    (c, runId) => lifecycle.recordOutcome(c, runId, { action: "Replaced the run capacitor.", minutes: 40, parts: [] }),
    held,
  ),
  row(queries.listOpenEscalations, "escalations.view", nothing, (c) => queries.listOpenEscalations(c)),
  row(queries.countOpenEscalations, "escalations.view", nothing, (c) => queries.countOpenEscalations(c)),
  row(queries.runsOfCall, "runs.view", newCall, (c, callId) => queries.runsOfCall(c, callId)),
  row(queries.historyOfUnit, "runs.view", nothing, (c) => queries.historyOfUnit(c, unitId)),
  row(reports.getReport, "reports.view", report, (c, id) => reports.getReport(c, id)),
  row(reports.sendReport, "reports.send", report, (c, id) => reports.sendReport(c, id, reportMailHtml)),
  // training
  row(scenarios.scenarioFormChoices, "training.write", nothing, (c) => scenarios.scenarioFormChoices(c, publishedTreeId)),
  row(scenarios.createScenario, "training.write", nothing, (c) =>
    scenarios.createScenario(c, publishedTreeId, scenarioFields("Domed capacitor", "cap-failed", SMALL_WORLD)),
  ),
  row(scenarios.updateScenario, "training.write", scenario, (c, id) =>
    scenarios.updateScenario(c, id, scenarioFields("Domed capacitor, renamed", "cap-failed", SMALL_WORLD)),
  ),
  row(
    scenarios.copyScenario,
    "training.write",
    async () => {
      const id = await scenario();
      const draft = await drafts.startDraft(lead, publishedTreeId);
      const { revision } = await drafts.replaceDraftContent(lead, draft.versionId, smallTree(`Authorisation copy ${tag()}`), 1);
      await publish.publishDraft(lead, publishedTreeId, revision, "A newer version to copy onto");
      return id;
    },
    (c, id) => scenarios.copyScenario(c, id),
  ),
  row(scenarios.getScenario, "training.write", scenario, (c, id) => scenarios.getScenario(c, id)),
  row(scenarios.listScenarios, "training.summary", nothing, (c) => scenarios.listScenarios(c)),
  row(practice.assignScenario, "training.write", scenario, (c, id) =>
    practice.assignScenario(c, id, { trainees: [tech.userId], dueOn: "2026-12-31" }),
  ),
  row(practice.withdrawAssignment, "training.write", assignment, (c, id) => practice.withdrawAssignment(c, id)),
  row(practice.myPractice, "training.practice", nothing, (c) => practice.myPractice(c)),
  row(practice.startPractice, "training.practice", assignment, (c, id) => practice.startPractice(c, id)),
  row(practice.finishPractice, "runs.outcome", practiceAtEnd, (c, p) => practice.finishPractice(c, p.runId), held),
  row(reviews.getPracticeReview, "training.review", practiceDone, (c, p) => reviews.getPracticeReview(c, p.runId)),
  row(reviews.addComment, "training.review", practiceDone, (c, p) =>
    reviews.addComment(c, p.runId, { seq: 0, text: "Good: the domed top was enough to call it." }),
  ),
  row(reviews.saveReview, "training.review", practiceDone, (c, p) => reviews.saveReview(c, p.runId, { note: "Quick and right." })),
  row(summary.trainingBoard, "training.summary", nothing, (c) => summary.trainingBoard(c)),
  row(summary.traineeProgress, "training.summary", nothing, (c) => summary.traineeProgress(c)),
  // trees
  row(library.listLibrary, "trees.view", nothing, (c) => library.listLibrary(c)),
  row(library.listPublished, "trees.view", nothing, (c) => library.listPublished(c)),
  row(versions.getTree, "trees.view", publishedTree, (c, t) => versions.getTree(c, t.treeId)),
  row(versions.loadVersion, "trees.view", publishedTree, (c, t) => versions.loadVersion(c, t.versionId), { label: "a published version" }),
  row(versions.loadVersion, "trees.author", publishedWithDraft, (c, t) => versions.loadVersion(c, t.draftId), { label: "the draft" }),
  row(versions.loadTreeVersion, "trees.view", publishedTree, (c, t) => versions.loadTreeVersion(c, t.treeId, 1), {
    label: "a published version",
  }),
  row(versions.loadTreeVersion, "trees.author", publishedWithDraft, (c, t) => versions.loadTreeVersion(c, t.treeId, "draft"), {
    label: "the draft",
  }),
  row(versions.diffVersions, "trees.view", publishedTree, (c, t) => versions.diffVersions(c, t.treeId, 1, 1), {
    label: "published versions",
  }),
  row(versions.diffVersions, "trees.author", publishedWithDraft, (c, t) => versions.diffVersions(c, t.treeId, 1, "draft"), {
    label: "with the draft",
  }),
  row(transfer.exportVersion, "trees.view", publishedTree, (c, t) => transfer.exportVersion(c, t.treeId, 1), {
    label: "a published version",
  }),
  row(transfer.exportVersion, "trees.author", publishedWithDraft, (c, t) => transfer.exportVersion(c, t.treeId, "draft"), {
    label: "the draft",
  }),
  row(transfer.importTree, "trees.author", nothing, (c) => transfer.importTree(c, serializeTree(smallTree(`Imported ${tag()}`)))),
  row(drafts.createPublishedTree, "trees.author", nothing, (c) => drafts.createPublishedTree(c, smallTree(`Seeded ${tag()}`), "First")),
  row(drafts.createDraftTree, "trees.author", nothing, (c) => drafts.createDraftTree(c, smallTree(`New ${tag()}`))),
  row(drafts.startDraft, "trees.author", publishedTree, (c, t) => drafts.startDraft(c, t.treeId)),
  row(drafts.replaceDraftContent, "trees.author", draftTree, (c, t) =>
    drafts.replaceDraftContent(c, t.versionId, smallTree(`Saved ${tag()}`), 1),
  ),
  row(drafts.discardDraft, "trees.author", publishedWithDraft, (c, t) => drafts.discardDraft(c, t.treeId)),
  row(editor.openEditor, "trees.author", draftTree, (c, t) => editor.openEditor(c, t.treeId)),
  row(publish.validateDraft, "trees.author", draftTree, (c, t) => publish.validateDraft(c, t.treeId)),
  row(publish.publishDraft, "trees.author", draftTree, (c, t) => publish.publishDraft(c, t.treeId, 1, "First version")),
  row(publish.retireVersion, "trees.author", publishedTree, (c, t) => publish.retireVersion(c, t.treeId, 1)),
  row(images.addTreeImage, "trees.author", draftTree, (c, t) => images.addTreeImage(c, t.treeId, TINY_PNG, "diagram.png")),
  row(
    images.getTreeImage,
    "trees.view",
    async () => {
      const { treeId } = await draftTree();
      return { treeId, imageId: (await images.addTreeImage(lead, treeId, TINY_PNG, "diagram.png")).id };
    },
    (c, t) => images.getTreeImage(c, t.treeId, t.imageId),
  ),
];

/** Model functions that take no caller: the token in an invitation or reset link is the key (or the e-mail asked for). */
const WITHOUT_CALLER = new Set<unknown>([
  people.findInvitation,
  people.acceptInvitation,
  passwordReset.requestPasswordReset,
  passwordReset.findPasswordReset,
  passwordReset.completePasswordReset,
]);

/** Rows in every table of the schema (one query), to see that a refusal wrote nothing. */
async function rowCounts(): Promise<Record<string, number>> {
  const tables = (Object.values(schema) as unknown[]).filter((t): t is MySqlTable => is(t, MySqlTable));
  const counts = await Promise.all(tables.map(async (t) => [getTableName(t), (await db().select({ n: count() }).from(t))[0]!.n] as const));
  return Object.fromEntries(counts);
}

describe("every model function decides who may, from the caller's role", () => {
  it.each(ROWS.map((r) => [r.label, r.action, r] as const))("%s — %s", async (_label, action, r) => {
    for (const ctx of ROLES) {
      const allowed = can(ctx, action, { holder: r.heldByTechnician === true && ctx.userId === tech.userId });
      const call = await r.call(ctx);
      if (allowed) {
        await call().catch((e: Error) => {
          throw new Error(`${ctx.role} may call ${r.label}, but it failed: ${e.message}`);
        });
      } else {
        const before = await rowCounts();
        await expect(call(), `${ctx.role} may not`).rejects.toMatchObject({
          kind: "forbidden",
          status: 403,
          message: POLICY[action].refusal,
        });
        expect(await rowCounts(), `${ctx.role}'s refused call wrote nothing`).toEqual(before);
      }
    }
  });

  it("the table names every exported model function", () => {
    const modules = import.meta.glob<Record<string, unknown>>("../../app/models/**/*.server.ts", { eager: true });
    const covered = new Set(ROWS.map((r) => r.fn));
    const missing: string[] = [];
    for (const [path, mod] of Object.entries(modules)) {
      // Files named _*.server.ts are the models' own helpers: they take no caller of their own.
      if (/\/_[^/]+$/.test(path)) continue;
      for (const [name, value] of Object.entries(mod)) {
        if (typeof value === "function" && !covered.has(value) && !WITHOUT_CALLER.has(value))
          missing.push(`${path.replace("../../", "")}: ${name}`);
      }
    }
    expect(missing).toEqual([]);
    expect(Object.keys(modules).length).toBeGreaterThan(15);
  });

  it("every action of the policy is exercised by some row", () => {
    const used = new Set(ROWS.map((r) => r.action));
    expect(Object.keys(POLICY).filter((a) => !used.has(a as Action))).toEqual([]);
  });
});
