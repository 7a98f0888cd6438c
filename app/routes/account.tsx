// /account — every signed-in person's own page: who they are in the shop (the owner decides role
// and shop), their name, their password, and where they are signed in, with a way to end each.
import { Form, redirect, useNavigation } from "react-router";
import { z } from "zod";
import { Field } from "~/components/Field";
import { Notice } from "~/components/PublicPage";
import { useFocusFirstError } from "~/components/useFocusFirstError";
import { requireUser, signOut } from "~/lib/auth.server";
import { atShop } from "~/lib/display";
import { PASSWORD_HINT } from "~/lib/forms";
import { clientAddress } from "~/lib/http.server";
import { ROLE_LABEL } from "~/lib/roles";
import { form, page, readForm } from "~/lib/route.server";
import { changePassword, endMySessions, getAccount, nameInput, renameSelf } from "~/models/account.server";
import type { Route } from "./+types/account";

export const meta: Route.MetaFunction = () => [{ title: "Your account · Cluepath" }];

export const loader = page(async ({ request }: Route.LoaderArgs) => {
  const { ctx, sessionId } = await requireUser(request);
  const a = await getAccount(ctx, { sessionId });
  return {
    ...a,
    sessions: a.sessions.map((s) => ({ ...s, signedInAt: atShop(s.signedInAt, a.timeZone), lastSeenAt: atShop(s.lastSeenAt, a.timeZone) })),
  };
});

const forms = {
  name: nameInput.extend({ intent: z.literal("name") }),
  password: z.object({
    intent: z.literal("password"),
    currentPassword: z.string().min(1, "Enter your current password.").max(1024, "That is not your current password."),
    newPassword: z.string().max(1024, "Use at most 128 characters."),
  }),
  end: z.object({ intent: z.literal("end"), ref: z.string().regex(/^[0-9a-f]{24}$/, "That session has already ended.") }),
  "end-others": z.object({ intent: z.literal("end-others") }),
};

export const action = form(async ({ request, context }: Route.ActionArgs) => {
  const { ctx, sessionId } = await requireUser(request);
  const caller = { sessionId, address: clientAddress(context) };
  const input = await readForm(request, (v) => forms[Object.hasOwn(forms, v.intent ?? "") ? (v.intent as keyof typeof forms) : "name"]);
  switch (input.intent) {
    case "name":
      await renameSelf(ctx, input);
      return { ok: true as const, done: "Your name is saved." };
    case "password": {
      const { otherSessionsEnded } = await changePassword(ctx, caller, input);
      return {
        ok: true as const,
        done: `Your password is changed.${otherSessionsEnded ? ` You were signed out of ${otherSessionsEnded} other session${otherSessionsEnded === 1 ? "" : "s"}.` : ""}`,
      };
    }
    case "end": {
      const { endedThisOne } = await endMySessions(ctx, caller, { ref: input.ref });
      if (endedThisOne) return redirect("/login?signedOut=1", { headers: await signOut(request) });
      return { ok: true as const, done: "That session is signed out." };
    }
    case "end-others": {
      const { ended } = await endMySessions(ctx, caller, { allButThis: true });
      return {
        ok: true as const,
        done: ended ? `Signed out of ${ended} other session${ended === 1 ? "" : "s"}.` : "You were not signed in anywhere else.",
      };
    }
  }
});

export default function Account({ loaderData: a, actionData }: Route.ComponentProps) {
  const nav = useNavigation();
  const busy = nav.state !== "idle";
  const ref = useFocusFirstError<HTMLDivElement>(actionData);
  const refused = actionData?.ok === false ? actionData : undefined;
  const sentIntent = refused?.values.intent;
  const errorsFor = (intent: string) => (sentIntent === intent ? (refused?.errors ?? {}) : {});
  const others = a.sessions.filter((s) => !s.current).length;
  return (
    <div ref={ref} className="space-y-6">
      <h1 className="text-2xl font-bold">Your account</h1>
      {actionData?.ok && <Notice kind="done">{actionData.done}</Notice>}
      {refused && (Object.keys(refused.errors).length === 0 || sentIntent === "end") && <Notice kind="problem">{refused.message}</Notice>}

      <section className="card space-y-4" aria-labelledby="who">
        <h2 id="who" className="text-lg font-bold">
          You in {a.shopName}
        </h2>
        <dl className="grid gap-x-4 gap-y-1 sm:grid-cols-[8rem_1fr]">
          <dt className="font-semibold">E-mail</dt>
          <dd className="break-all">{a.email}</dd>
          <dt className="font-semibold">Shop</dt>
          <dd>
            {a.shopName} · {a.shopTown}
          </dd>
          <dt className="font-semibold">Role</dt>
          <dd>{ROLE_LABEL[a.role]}</dd>
        </dl>
        <p className="text-ink-soft">Your shop's owner sets your role and e-mail address. Ask them if either should change.</p>
        <Form method="post" noValidate className="flex flex-wrap items-end gap-3">
          <input type="hidden" name="intent" value="name" />
          <Field
            className="min-w-0 flex-1 basis-56"
            label="Your name"
            name="name"
            autoComplete="name"
            hint="As customers see it on reports."
            defaultValue={sentIntent === "name" ? refused?.values.name : a.name}
            error={errorsFor("name").name}
          />
          <button className="btn-quiet" disabled={busy}>
            Save name
          </button>
        </Form>
      </section>

      <section className="space-y-3" aria-labelledby="where">
        <h2 id="where" className="text-lg font-bold">
          Where you are signed in
        </h2>
        <ul className="space-y-2">
          {a.sessions.map((s) => (
            <li key={s.ref} className="card flex flex-wrap items-center justify-between gap-3">
              <div className="min-w-0">
                <p className="font-semibold">
                  {s.device}
                  {s.current && <span className="ml-2 rounded bg-copper-soft px-2 py-0.5 text-base text-copper-dark">This device</span>}
                </p>
                <p className="text-ink-soft">
                  Last seen {s.lastSeenAt}
                  {s.address ? ` · from ${s.address}` : ""}
                </p>
                <p className="text-ink-soft">
                  Signed in {s.signedInAt}
                  {s.shopName !== a.shopName ? ` · ${s.shopName}` : ""}
                </p>
              </div>
              <Form method="post">
                <input type="hidden" name="intent" value="end" />
                <input type="hidden" name="ref" value={s.ref} />
                <button
                  className="btn-quiet min-h-11 text-base"
                  disabled={busy}
                  aria-label={s.current ? "Sign out here (this device)" : `Sign out of this one: ${s.device}, last seen ${s.lastSeenAt}`}
                >
                  {s.current ? "Sign out here" : "Sign out of this one"}
                </button>
              </Form>
            </li>
          ))}
        </ul>
        {others > 0 && (
          <Form method="post">
            <input type="hidden" name="intent" value="end-others" />
            <button className="btn-quiet w-full sm:w-auto" disabled={busy}>
              Sign out everywhere else ({others})
            </button>
          </Form>
        )}
      </section>

      <section className="card space-y-4" aria-labelledby="pw">
        <h2 id="pw" className="text-lg font-bold">
          Change your password
        </h2>
        <Form method="post" noValidate className="space-y-4">
          <input type="hidden" name="intent" value="password" />
          {/* For password managers: the account the new password belongs to. */}
          <input type="email" name="username" autoComplete="username" value={a.email} readOnly hidden />
          <Field
            label="Current password"
            name="currentPassword"
            type="password"
            autoComplete="current-password"
            error={errorsFor("password").currentPassword}
          />
          <Field
            label="New password"
            name="newPassword"
            type="password"
            autoComplete="new-password"
            hint={PASSWORD_HINT}
            error={errorsFor("password").newPassword}
          />
          <p className="text-ink-soft">Changing it signs you out everywhere else.</p>
          <button className="btn-primary" disabled={busy}>
            Change password
          </button>
        </Form>
      </section>
    </div>
  );
}
