import { Form, useNavigation } from "react-router";
import { z } from "zod";
import { Field } from "~/components/Field";
import { SelectField } from "~/components/FormFields";
import { MemberCard } from "~/components/MemberCard";
import { Notice } from "~/components/PublicPage";
import { requireUser } from "~/lib/auth.server";
import { clientAddress, fromClient, publicLink } from "~/lib/http.server";
import { form, page, readForm } from "~/lib/route.server";
import { ROLE_LABEL, ROLES } from "~/lib/roles";
import { resetMemberSignIn, setMemberActive, setMemberRole } from "~/models/members.server";
import { invite, listMembers, listOpenInvitations, revokeInvitation, sendInvitationMail } from "~/models/people.server";
import type { Route } from "./+types/people";

export const meta: Route.MetaFunction = () => [{ title: "People · Cluepath" }];

export const loader = page(async ({ request }: Route.LoaderArgs) => {
  const { ctx } = await requireUser(request);
  const [members, invitations] = await Promise.all([listMembers(ctx), listOpenInvitations(ctx)]);
  return {
    members: members.map(({ deactivatedAt, ...m }) => ({ ...m, active: deactivatedAt === null, you: m.userId === ctx.userId })),
    invitations,
  };
});

const inviteForm = z.object({
  intent: z.literal("invite"),
  email: z.string().trim().min(1, "Enter the person's e-mail address.").email("That doesn't look like an e-mail address."),
  role: z.enum(ROLES, { message: "Choose a role." }),
});
const revokeForm = z.object({ intent: z.literal("revoke"), id: z.string().uuid("That invitation was not found.") });
const person = z.string().uuid("That person was not found.");
const memberForms = {
  role: z.object({ intent: z.literal("role"), userId: person, role: z.enum(ROLES, { message: "Choose a role." }) }),
  deactivate: z.object({ intent: z.literal("deactivate"), userId: person }),
  reactivate: z.object({ intent: z.literal("reactivate"), userId: person }),
  reset: z.object({ intent: z.literal("reset"), userId: person }),
};
const pick = (values: Record<string, string>) =>
  values.intent === "revoke"
    ? revokeForm
    : Object.hasOwn(memberForms, values.intent ?? "")
      ? memberForms[values.intent as keyof typeof memberForms]
      : inviteForm;

export const action = form(async ({ request, context }: Route.ActionArgs) => {
  const ctx = fromClient((await requireUser(request, "people.manage")).ctx, context);
  const address = clientAddress(context);
  const input = await readForm(request, pick);
  switch (input.intent) {
    case "revoke":
      await revokeInvitation(ctx, input.id);
      return { ok: true as const, kind: "revoked" as const };
    case "role": {
      const { changed, name } = await setMemberRole(ctx, input.userId, input.role, address);
      return {
        ok: true as const,
        kind: "member" as const,
        done: changed ? `${name} is now ${ROLE_LABEL[input.role]}.` : `${name} already is ${ROLE_LABEL[input.role]}.`,
      };
    }
    case "deactivate":
    case "reactivate": {
      const on = input.intent === "reactivate";
      const { sessionsEnded, name } = await setMemberActive(ctx, input.userId, on, address);
      const ended = sessionsEnded ? ` and was signed out (${sessionsEnded} session${sessionsEnded === 1 ? "" : "s"})` : "";
      return {
        ok: true as const,
        kind: "member" as const,
        done: on ? `${name}'s access is back on: they can sign in again.` : `${name}'s access is off${ended}. Their runs and reports stay.`,
      };
    }
    case "reset": {
      const r = await resetMemberSignIn(ctx, input.userId, (token) => publicLink(request, `/reset-password/${token}`), address);
      return {
        ok: true as const,
        kind: "member" as const,
        done: `${r.sessionsEnded ? `${r.name} is signed out (${r.sessionsEnded} session${r.sessionsEnded === 1 ? "" : "s"}). ` : ""}${
          r.mailed
            ? `We e-mailed ${r.email} a link to set a new password (valid 30 minutes).`
            : `The mail server did not take the message to ${r.email}; try Reset sign-in again in a moment.`
        }`,
      };
    }
  }
  const { token } = await invite(ctx, input.email, input.role);
  const link = publicLink(request, `/invite/${token}`);
  const mailed = await sendInvitationMail(ctx, input.email, input.role, link);
  return { ok: true as const, kind: "invited" as const, email: input.email, link, mailed };
});

export default function People({ loaderData, actionData }: Route.ComponentProps) {
  const busy = useNavigation().state !== "idle";
  const invalid = actionData?.ok === false ? actionData : undefined;
  return (
    <div className="space-y-6">
      <h1 className="text-2xl font-bold">People</h1>
      <section className="card space-y-3">
        <h2 className="text-lg font-bold">Invite someone</h2>
        {actionData?.ok && actionData.kind === "invited" && (
          <div role="status" className="rounded-lg bg-within-soft p-3 text-within">
            <p className="font-semibold">Invitation made for {actionData.email}.</p>
            <p className="text-ink">
              {actionData.mailed
                ? "We e-mailed them this link (valid 7 days). You can also pass it on yourself:"
                : "The mail server did not take the message. Pass this link on yourself (valid 7 days):"}
            </p>
            <input readOnly aria-label="Invitation link" className="field-input mt-2 text-base" value={actionData.link} />
          </div>
        )}
        {/* A new key after each invitation empties the form for the next one. */}
        <Form
          key={actionData?.ok && actionData.kind === "invited" ? actionData.link : "invite"}
          method="post"
          className="grid gap-4 sm:grid-cols-[1fr_12rem_auto] sm:items-end"
          noValidate
        >
          <input type="hidden" name="intent" value="invite" />
          <Field label="Email" name="email" type="email" defaultValue={invalid?.values.email} error={invalid?.errors.email} />
          <SelectField label="Role" name="role" defaultValue={invalid?.values.role || "technician"} error={invalid?.errors.role}>
            {ROLES.map((r) => (
              <option key={r} value={r}>
                {ROLE_LABEL[r]}
              </option>
            ))}
          </SelectField>
          <button className="btn-primary" disabled={busy}>
            Invite
          </button>
        </Form>
      </section>
      <section aria-labelledby="members">
        <h2 id="members" className="mb-2 text-lg font-bold">
          Members
        </h2>
        {actionData?.ok && actionData.kind === "member" && <Notice kind="done">{actionData.done}</Notice>}
        {invalid && invalid.values.intent !== "invite" && <Notice kind="problem">{invalid.message}</Notice>}
        <ul className="space-y-2">
          {loaderData.members.map((m) => (
            <MemberCard key={m.userId} m={m} busy={busy} />
          ))}
        </ul>
      </section>
      <section>
        <h2 className="mb-2 text-lg font-bold">Open invitations</h2>
        {loaderData.invitations.length === 0 ? (
          <p className="text-ink-soft">None.</p>
        ) : (
          <ul className="space-y-2">
            {loaderData.invitations.map((i) => (
              <li key={i.id} className="card flex flex-wrap items-center justify-between gap-2">
                <span>
                  {i.email} · {ROLE_LABEL[i.role]} · until {i.expiresAt.toISOString().slice(0, 10)}
                </span>
                <Form method="post">
                  <input type="hidden" name="intent" value="revoke" />
                  <input type="hidden" name="id" value={i.id} />
                  <button className="btn-quiet min-h-11 text-base">Withdraw</button>
                </Form>
              </li>
            ))}
          </ul>
        )}
      </section>
    </div>
  );
}
