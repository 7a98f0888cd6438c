// /forgot-password — asks for the e-mail and sends a link to set a new password. The answer is the
// same whether or not the e-mail has an account (no enumeration); requests are rate-limited.
import { data, Form, Link, useNavigation } from "react-router";
import { z } from "zod";
import { Field } from "~/components/Field";
import { Notice, PublicPage } from "~/components/PublicPage";
import { useFocusFirstError } from "~/components/useFocusFirstError";
import { clientAddress, publicLink } from "~/lib/http.server";
import { form, readForm, type FormRefusal } from "~/lib/route.server";
import { RESET_MINUTES, requestPasswordReset } from "~/models/password-reset.server";
import type { Route } from "./+types/forgot-password";

export const meta: Route.MetaFunction = () => [{ title: "Forgot your password? · Cluepath" }];

const Ask = z.object({
  email: z
    .string()
    .trim()
    .min(1, "Enter your e-mail address.")
    .max(254, "That e-mail address is too long.")
    .email("That doesn't look like an e-mail address."),
});

export const action = form(async ({ request, context }: Route.ActionArgs) => {
  const { email } = await readForm(request, Ask);
  const result = await requestPasswordReset(email, { address: clientAddress(context) }, (token) =>
    publicLink(request, `/reset-password/${token}`),
  );
  if (result.kind === "rate-limited") {
    const refused: FormRefusal = {
      ok: false,
      message: "Too many requests from here. Wait 15 minutes and ask again, or ask your shop's owner.",
      errors: {},
      values: { email },
    };
    return data(refused, { status: 429 });
  }
  return { ok: true as const, email, minutes: RESET_MINUTES };
});

export default function ForgotPassword({ actionData }: Route.ComponentProps) {
  const busy = useNavigation().state !== "idle";
  const ref = useFocusFirstError(actionData);
  const refused = actionData?.ok === false ? actionData : undefined;
  return (
    <PublicPage>
      <h1 className="text-2xl font-bold">Forgot your password?</h1>
      {actionData?.ok ? (
        <>
          <Notice kind="done">
            <p className="font-semibold">Check your e-mail.</p>
            <p className="text-ink">
              If {actionData.email} belongs to a Cluepath account, a link to set a new password is on its way to it. The link works once,
              within {actionData.minutes} minutes.
            </p>
          </Notice>
          <p className="text-ink-soft">
            Nothing after a few minutes? Look in the spam folder, check the address, or ask your shop's owner to send you a link.
          </p>
        </>
      ) : (
        <>
          <p className="mt-1 text-ink-soft">Type the e-mail you sign in with. We'll send you a link to choose a new password.</p>
          {refused && Object.keys(refused.errors).length === 0 && <Notice kind="problem">{refused.message}</Notice>}
          <Form ref={ref} method="post" className="mt-6 space-y-5" noValidate>
            <Field
              label="Email"
              name="email"
              type="email"
              autoComplete="username"
              defaultValue={refused?.values.email}
              error={refused?.errors.email}
            />
            <button className="btn-primary w-full" disabled={busy}>
              {busy ? "Sending…" : "Send me a link"}
            </button>
          </Form>
        </>
      )}
      <p className="mt-6">
        <Link to="/login" className="inline-flex min-h-11 items-center font-semibold">
          ← Back to sign in
        </Link>
      </p>
    </PublicPage>
  );
}
