// /reset-password/:token — the link from the reset mail: choose a new password (the sign-up rules),
// which ends every other session and signs the person in here. No session needed: the token is the key.
import { Form, Link, redirect, useNavigation } from "react-router";
import { z } from "zod";
import { Field } from "~/components/Field";
import { Notice, PublicPage } from "~/components/PublicPage";
import { useFocusFirstError } from "~/components/useFocusFirstError";
import { sessionCookie } from "~/lib/auth.server";
import { PASSWORD_HINT } from "~/lib/forms";
import { clientAddress } from "~/lib/http.server";
import { HOME_PATH } from "~/lib/roles";
import { form, readForm } from "~/lib/route.server";
import { completePasswordReset, findPasswordReset } from "~/models/password-reset.server";
import type { Route } from "./+types/reset-password.$token";

export const meta: Route.MetaFunction = () => [{ title: "Set a new password · Cluepath" }];

export async function loader({ params }: Route.LoaderArgs) {
  const found = await findPasswordReset(params.token);
  return { email: found?.email ?? null };
}

const NewPassword = z.object({
  password: z.string({ message: "Choose a new password." }).min(1, "Choose a new password.").max(1024, "Use at most 128 characters."),
});

export const action = form(async ({ request, params, context }: Route.ActionArgs) => {
  const { password } = await readForm(request, NewPassword);
  const done = await completePasswordReset(params.token, password, {
    address: clientAddress(context),
    userAgent: request.headers.get("user-agent"),
  });
  return redirect(HOME_PATH[done.role], { headers: await sessionCookie(done.sessionId, done.userId) });
});

function LinkGone({ message }: { message?: string }) {
  return (
    <>
      <h1 className="text-2xl font-bold">This link can't be used</h1>
      <p className="mt-2 text-ink-soft">{message ?? "It has expired or was already used. Links work once, for 30 minutes."}</p>
      <p className="mt-6 flex flex-wrap gap-3">
        <Link to="/forgot-password" className="btn-primary">
          Send me a new link
        </Link>
        <Link to="/login" className="btn-quiet">
          Sign in
        </Link>
      </p>
    </>
  );
}

export default function ResetPassword({ loaderData, actionData }: Route.ComponentProps) {
  const busy = useNavigation().state !== "idle";
  const ref = useFocusFirstError(actionData);
  const refused = actionData?.ok === false ? actionData : undefined;
  if (!loaderData.email || refused?.code === "link-gone") return <PublicPage>{<LinkGone message={refused?.message} />}</PublicPage>;
  return (
    <PublicPage>
      <h1 className="text-2xl font-bold">Set a new password</h1>
      <p className="mt-1 text-ink-soft">You will be signed in here and signed out everywhere else.</p>
      {refused && Object.keys(refused.errors).length === 0 && <Notice kind="problem">{refused.message}</Notice>}
      <Form ref={ref} method="post" className="mt-6 space-y-5" noValidate>
        {/* The account's e-mail, for password managers to save the new password under. */}
        <Field label="Email" name="username" type="email" autoComplete="username" value={loaderData.email} readOnly />
        <Field
          label="New password"
          name="password"
          type="password"
          autoComplete="new-password"
          hint={PASSWORD_HINT}
          error={refused?.errors.password}
        />
        <button className="btn-primary w-full" disabled={busy}>
          {busy ? "Saving…" : "Save and sign in"}
        </button>
      </Form>
    </PublicPage>
  );
}
