import { Form, Link, redirect, useNavigation } from "react-router";
import { z } from "zod";
import { Field } from "~/components/Field";
import { Notice, PublicPage } from "~/components/PublicPage";
import { useFocusFirstError } from "~/components/useFocusFirstError";
import { sessionCookie } from "~/lib/auth.server";
import { PASSWORD_HINT } from "~/lib/forms";
import { clientAddress } from "~/lib/http.server";
import { HOME_PATH, ROLE_LABEL } from "~/lib/roles";
import { form, readForm } from "~/lib/route.server";
import { acceptInvitation, findInvitation } from "~/models/people.server";
import type { Route } from "./+types/invite.$token";

export const meta: Route.MetaFunction = () => [{ title: "Join a shop · Cluepath" }];

// No session here: the token in the link is the key.
export async function loader({ params }: Route.LoaderArgs) {
  const inv = await findInvitation(params.token);
  if (!inv) return { invitation: null };
  return { invitation: { email: inv.email, role: inv.role, shopName: inv.shopName, hasAccount: inv.hasAccount } };
}

const Join = z.object({
  name: z.string().trim().max(120, "Keep your name under 120 characters.").optional(),
  password: z.string({ message: "Enter a password." }).max(1024, "Use at most 128 characters."),
});

// Accepting signs the person in to the shop they joined and takes them to their role's home.
export const action = form(async ({ request, params, context }: Route.ActionArgs) => {
  const input = await readForm(request, Join);
  const joined = await acceptInvitation(params.token, input, {
    address: clientAddress(context),
    userAgent: request.headers.get("user-agent"),
  });
  return redirect(HOME_PATH[joined.role], { headers: await sessionCookie(joined.sessionId, joined.userId) });
});

export default function Invite({ loaderData, actionData }: Route.ComponentProps) {
  const inv = loaderData.invitation;
  const busy = useNavigation().state !== "idle";
  const ref = useFocusFirstError(actionData);
  const refused = actionData?.ok === false ? actionData : undefined;
  const errors = refused?.errors ?? {};
  const formError = refused && Object.keys(errors).length === 0 ? refused.message : undefined;
  return (
    <PublicPage>
      {!inv ? (
        <>
          <h1 className="text-2xl font-bold">This invitation can't be used</h1>
          <p className="mt-2 text-ink-soft">
            It has expired, was withdrawn, or was already used. If you have joined already, sign in. Otherwise ask your shop's owner for a
            new invitation.
          </p>
          <p className="mt-6 flex flex-wrap gap-3">
            <Link to="/login" className="btn-primary">
              Sign in
            </Link>
            <Link to="/forgot-password" className="btn-quiet">
              Forgot your password?
            </Link>
          </p>
        </>
      ) : (
        <>
          <h1 className="text-2xl font-bold">Join {inv.shopName}</h1>
          <p className="mt-1 text-ink-soft">
            You are invited as <strong>{ROLE_LABEL[inv.role]}</strong>.
          </p>
          {formError && <Notice kind="problem">{formError}</Notice>}
          <Form ref={ref} method="post" className="mt-6 space-y-5" noValidate>
            {/* The e-mail the invitation is for: shown, and the username a password manager saves. */}
            <Field
              label="Email"
              name="username"
              type="email"
              autoComplete="username"
              value={inv.email}
              readOnly
              hint="The invitation is for this address; you sign in with it."
            />
            {inv.hasAccount ? (
              <Field
                label="Password of your existing account"
                name="password"
                type="password"
                autoComplete="current-password"
                error={errors.password}
              />
            ) : (
              <>
                <Field label="Your name" name="name" autoComplete="name" defaultValue={refused?.values.name} error={errors.name} />
                <Field
                  label="Choose a password"
                  name="password"
                  type="password"
                  autoComplete="new-password"
                  hint={PASSWORD_HINT}
                  error={errors.password}
                />
              </>
            )}
            <button className="btn-primary w-full" disabled={busy}>
              {busy ? "Joining…" : "Join the shop"}
            </button>
          </Form>
        </>
      )}
    </PublicPage>
  );
}
