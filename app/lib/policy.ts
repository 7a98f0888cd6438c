// Who may do what: one table of actions × roles, read by every model function before it returns or
// changes data (and by routes that only need to know what to offer). Pure, so the UI may read it.
// Relations to a record that roles alone can't say ("the technician holding this run") are facts
// the model passes in; the table says which actions they open.
import type { Ctx } from "./context";
import { Refusal } from "./refusal";
import { ROLES, type Role } from "./roles";

export type Rule = {
  /** Roles allowed whatever their relation to the record. */
  roles: readonly Role[];
  /** Also allowed to whoever holds the run (its current technician), whatever their role. */
  orHolder?: true;
  /** What the refused caller reads. */
  refusal: string;
};

const EVERYONE = ROLES;
const FIELD: readonly Role[] = ["technician", "lead", "owner"];
// Owners may do what leads do: the owner is written out on every lead row (a unit test holds it).
const LEADS: readonly Role[] = ["lead", "owner"];
const TRAINERS: readonly Role[] = ["trainer", ...LEADS];

export const POLICY = {
  // Calls, customers, sites and units.
  "calls.view": { roles: EVERYONE, refusal: "Your role cannot see service calls." },
  "calls.mine": { roles: ["technician"], refusal: "My calls is the technician's list; open Calls instead." },
  "calls.write": { roles: FIELD, refusal: "Only technicians, leads and owners open and change service calls." },
  "equipment.view": { roles: EVERYONE, refusal: "Your role cannot see customers and equipment." },
  "equipment.write": { roles: FIELD, refusal: "Only technicians, leads and owners add and change customers, sites and units." },
  "meters.view": { roles: EVERYONE, refusal: "Your role cannot see the shop's meters." },
  "meters.manage": { roles: LEADS, refusal: "Only leads and owners keep the list of meters." },
  // Trees: everyone reads published versions; authors work on drafts.
  "trees.view": { roles: EVERYONE, refusal: "Your role cannot see the trees." },
  "trees.author": { roles: LEADS, refusal: "Only leads and owners write, publish and retire trees." },
  // Runs.
  "runs.view": { roles: EVERYONE, refusal: "Your role cannot see runs." },
  "runs.start": { roles: FIELD, refusal: "Only technicians, leads and owners start runs on a call." },
  "runs.step": { roles: [], orHolder: true, refusal: "Only the technician holding this run can add steps. A lead can take it over first." },
  "runs.note": { roles: [], orHolder: true, refusal: "Only the technician holding this run can add notes." },
  "runs.photo": { roles: [], orHolder: true, refusal: "Only the technician holding this run can add or remove its photos." },
  "runs.pause": { roles: [], orHolder: true, refusal: "Only the technician holding this run can pause or resume it." },
  "runs.escalate": { roles: [], orHolder: true, refusal: "Only the technician holding this run can escalate it." },
  "runs.outcome": { roles: [], orHolder: true, refusal: "Only the technician holding this run can record its outcome." },
  "runs.abandon": { roles: LEADS, orHolder: true, refusal: "Only the technician holding this run, or a lead, can abandon it." },
  "runs.take-over": { roles: LEADS, refusal: "Only a lead or the owner can take over a run." },
  "escalations.view": { roles: LEADS, refusal: "Escalations are for leads and owners." },
  "reports.view": { roles: EVERYONE, refusal: "Your role cannot see service reports." },
  "reports.send": { roles: FIELD, refusal: "Only technicians, leads and owners e-mail service reports to customers." },
  // The shop.
  "shop.view": { roles: EVERYONE, refusal: "Your role cannot see the shop's settings." },
  "outbox.view": { roles: LEADS, refusal: "The outbox is for leads and owners." },
  "people.manage": { roles: ["owner"], refusal: "Only the shop's owner manages people: invitations, roles, access and sign-in resets." },
  // Everyone's own account: name, password, sessions.
  "account.self": { roles: EVERYONE, refusal: "Sign in to see your account." },
  "audit.view": { roles: ["owner"], refusal: "The audit trail is for the shop's owner." },
  "shop.overview": { roles: LEADS, refusal: "The overview is for the shop's owner and its leads." },
  // Training: trainers and leads (and so the owner) write scenarios, assign and review them; the
  // technician takes the practice assigned to them.
  "training.summary": { roles: TRAINERS, refusal: "Training summaries are for trainers, leads and the owner." },
  "training.write": { roles: TRAINERS, refusal: "Your role cannot write or assign practice scenarios: trainers and leads do." },
  "training.review": { roles: TRAINERS, refusal: "Your role cannot review practice runs: trainers and leads do." },
  "training.practice": { roles: ["technician"], refusal: "Practice is for technicians; a trainer assigns it." },
} as const satisfies Record<string, Rule>;

export type Action = keyof typeof POLICY;
export const ACTIONS = Object.keys(POLICY) as Action[];

/** What the model knows about the caller's relation to the record. */
export type Facts = { holder?: boolean };

export function can(who: Pick<Ctx, "role">, action: Action, facts: Facts = {}): boolean {
  const rule: Rule = POLICY[action];
  return rule.roles.includes(who.role) || (rule.orHolder === true && facts.holder === true);
}

/** Throws a `forbidden` Refusal, worded for the action, unless the caller may. */
export function authorize(who: Pick<Ctx, "role">, action: Action, facts: Facts = {}): void {
  if (!can(who, action, facts)) throw new Refusal("forbidden", POLICY[action].refusal);
}
