import { index, layout, route, type RouteConfig } from "@react-router/dev/routes";

export default [
  index("routes/index.ts"),
  route("login", "routes/login.tsx"),
  route("logout", "routes/logout.ts"),
  route("invite/:token", "routes/invite.tsx"),
  route("auth/*", "routes/auth.ts"),
  route("healthz", "routes/healthz.ts"),
  layout("routes/shell.tsx", [
    route("calls", "routes/home-technician.tsx"),
    route("authoring", "routes/home-lead.tsx"),
    route("training", "routes/home-trainer.tsx"),
    route("overview", "routes/home-owner.tsx"),
    route("equipment", "routes/equipment.tsx"),
    route("equipment/:unitId", "routes/equipment-unit.tsx"),
    route("people", "routes/people.tsx"),
  ]),
] satisfies RouteConfig;
