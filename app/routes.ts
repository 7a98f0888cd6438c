// The route config, written out: each URL and the module that serves it. Module files are named
// after their URL in the framework's flat-routes style (`.` for `/`, `$` for a parameter, `_index`
// for a folder's own page, `_shell` for the pathless layout), so a URL leads to its file. A form
// that serves two URLs (new and edit) is one module, named after the "new" URL; the edit URL maps
// to it below with its own id.
import { index, layout, route, type RouteConfig } from "@react-router/dev/routes";

export default [
  index("routes/_index.ts"),
  route("login", "routes/login.tsx"),
  route("logout", "routes/logout.ts"),
  route("invite/:token", "routes/invite.$token.tsx"),
  route("forgot-password", "routes/forgot-password.tsx"),
  route("reset-password/:token", "routes/reset-password.$token.tsx"),
  route("auth/*", "routes/auth.$.ts"),
  route("healthz", "routes/healthz.ts"),
  // Field runs: JSON resource routes used by the runner.
  route("api/runs", "routes/api.runs.ts"),
  route("api/runs/:runId", "routes/api.runs.$runId.ts"),
  route("api/runs/:runId/steps", "routes/api.runs.$runId.steps.ts"),
  route("api/runs/:runId/notes", "routes/api.runs.$runId.notes.ts"),
  route("api/runs/:runId/photos", "routes/api.runs.$runId.photos.ts"),
  route("api/runs/:runId/status", "routes/api.runs.$runId.status.ts"),
  route("api/runs/:runId/outcome", "routes/api.runs.$runId.outcome.ts"),
  route("api/runs/:runId/finish", "routes/api.runs.$runId.finish.ts"),
  route("api/photos/:photoId", "routes/api.photos.$photoId.ts"),
  route("api/field-kit", "routes/api.field-kit.ts"),
  route("api/reports/:reportId/send", "routes/api.reports.$reportId.send.ts"),
  // Owner insights: CSV of one overview table, and "found here before" for the runner.
  route("api/insights/csv/:table", "routes/api.insights.csv.ts"),
  route("api/insights/found-here", "routes/api.insights.found-here.ts"),
  // Field runs: the phone runner and the printable report, full screen (outside the shell).
  route("runs/:runId", "routes/runs.$runId.tsx"),
  route("phone", "routes/phone.tsx"),
  route("reports/:reportId", "routes/reports.$reportId.tsx"),
  // Authoring: the trees API, the editor (full screen, outside the shell), downloads and images.
  route("api/trees", "routes/api.trees.ts"),
  route("api/trees/:treeId", "routes/api.trees.$treeId.ts"),
  route("api/trees/:treeId/versions/:ref", "routes/api.trees.$treeId.versions.$ref.ts"),
  route("api/trees/:treeId/draft", "routes/api.trees.$treeId.draft.ts"),
  route("api/trees/:treeId/validation", "routes/api.trees.$treeId.validation.ts"),
  route("api/trees/:treeId/diff", "routes/api.trees.$treeId.diff.ts"),
  route("api/trees/:treeId/images", "routes/api.trees.$treeId.images.ts"),
  route("trees/:treeId/edit", "routes/trees.$treeId.edit.tsx"),
  route("trees/:treeId/versions/:ref/export", "routes/trees.$treeId.versions.$ref.export.ts"),
  route("trees/:treeId/images/:imageId", "routes/trees.$treeId.images.$imageId.ts"),
  layout("routes/_shell.tsx", [
    // Each role's home.
    route("calls", "routes/calls._index.tsx"),
    route("authoring", "routes/authoring.tsx"),
    route("training", "routes/training.tsx"),
    route("overview", "routes/overview.tsx"),
    // Field runs: calls, customers, sites, units, meters, escalations, outbox.
    route("calls/all", "routes/calls.all.tsx"),
    route("calls/new", "routes/calls.new.tsx"),
    route("calls/:callId", "routes/calls.$callId.tsx"),
    route("calls/:callId/edit", "routes/calls.new.tsx", { id: "routes/calls.$callId.edit" }),
    route("customers", "routes/customers._index.tsx"),
    route("customers/new", "routes/customers.new.tsx"),
    route("customers/:customerId", "routes/customers.$customerId.tsx"),
    route("customers/:customerId/edit", "routes/customers.new.tsx", { id: "routes/customers.$customerId.edit" }),
    route("customers/:customerId/sites/new", "routes/customers.$customerId.sites.new.tsx"),
    route("sites/:siteId", "routes/sites.$siteId.tsx"),
    route("sites/:siteId/edit", "routes/customers.$customerId.sites.new.tsx", { id: "routes/sites.$siteId.edit" }),
    route("sites/:siteId/units/new", "routes/sites.$siteId.units.new.tsx"),
    route("equipment", "routes/equipment._index.tsx"),
    route("equipment/:unitId", "routes/equipment.$unitId.tsx"),
    route("equipment/:unitId/edit", "routes/sites.$siteId.units.new.tsx", { id: "routes/equipment.$unitId.edit" }),
    route("meters", "routes/meters._index.tsx"),
    route("meters/:meterId", "routes/meters.$meterId.tsx"),
    route("escalations", "routes/escalations.tsx"),
    route("outbox", "routes/outbox.tsx"),
    route("people", "routes/people.tsx"),
    // Training: the trainer's scenarios and reviews, the technician's practice list.
    route("training/scenarios/new", "routes/training.scenarios.new.tsx"),
    route("training/scenarios/:scenarioId", "routes/training.scenarios.$scenarioId.tsx"),
    route("training/scenarios/:scenarioId/edit", "routes/training.scenarios.new.tsx", { id: "routes/training.scenarios.$scenarioId.edit" }),
    route("training/runs/:runId", "routes/training.runs.$runId.tsx"),
    route("practice", "routes/practice.tsx"),
    route("account", "routes/account.tsx"),
    route("audit", "routes/audit.tsx"),
    // Authoring: the library, a tree, its versions and diffs, new trees and imports.
    route("trees", "routes/trees._index.tsx"),
    route("trees/new", "routes/trees.new.tsx"),
    route("trees/import", "routes/trees.import.tsx"),
    route("trees/:treeId", "routes/trees.$treeId.tsx"),
    route("trees/:treeId/versions/:ref", "routes/trees.$treeId.versions.$ref.tsx"),
    route("trees/:treeId/diff", "routes/trees.$treeId.diff.tsx"),
  ]),
] satisfies RouteConfig;
