import { data, Form, Link, redirect, useNavigation } from "react-router";
import { z } from "zod";
import { getUser, safeNext, signInWithPassword } from "~/lib/auth.server";
import { clientAddress } from "~/lib/http.server";
import { HOME_PATH } from "~/lib/roles";
import { Field } from "~/components/Field";
import type { Route } from "./+types/login";

export const meta: Route.MetaFunction = () => [{ title: "Sign in · Cluepath" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await getUser(request);
  const url = new URL(request.url);
  if (user) throw redirect(safeNext(url.searchParams.get("next"), HOME_PATH[user.role]));
  return { signedOut: url.searchParams.has("signedOut"), next: url.searchParams.get("next") };
}

const form = z.object({
  email: z.string().trim().min(1, "Enter your e-mail address.").email("That doesn't look like an e-mail address."),
  password: z.string().min(1, "Enter your password."),
  next: z.string().optional(),
});

export async function action({ request, context }: Route.ActionArgs) {
  const raw = Object.fromEntries(await request.formData());
  const parsed = form.safeParse(raw);
  const email = typeof raw.email === "string" ? raw.email : "";
  if (!parsed.success) {
    const fields = z.flattenError(parsed.error).fieldErrors;
    return data(
      { email, fieldErrors: { email: fields.email?.[0], password: fields.password?.[0] }, formError: undefined },
      { status: 400 },
    );
  }
  const result = await signInWithPassword(request, clientAddress(context), parsed.data.email, parsed.data.password);
  if (!result.ok) {
    const formError =
      result.reason === "too_many"
        ? "Too many sign-in attempts. Wait 15 minutes and try again, or ask your shop owner for help."
        : result.reason === "access_off"
          ? "Your shop's owner has turned off your access to Cluepath. Ask them to turn it back on."
          : "That e-mail and password don't match an account. Check both and try again.";
    return data(
      { email, fieldErrors: {}, formError },
      { status: result.reason === "too_many" ? 429 : result.reason === "access_off" ? 403 : 401 },
    );
  }
  throw redirect(safeNext(parsed.data.next, result.home), { headers: result.headers });
}

export default function Login({ loaderData, actionData }: Route.ComponentProps) {
  const nav = useNavigation();
  const busy = nav.state !== "idle";
  const next = loaderData.next;
  const errors: { email?: string; password?: string } = actionData?.fieldErrors ?? {};
  return (
    <main className="mx-auto flex min-h-dvh max-w-md flex-col justify-center px-5 py-10">
      <div className="mb-8">
        <p className="text-3xl font-bold tracking-tight">
          Clue<span className="text-copper">path</span>
        </p>
        <p className="text-ink-soft">Diagnostic procedures for kitchen equipment service.</p>
      </div>
      <h1 className="mb-4 text-2xl font-bold">Sign in</h1>
      {loaderData.signedOut && (
        <p role="status" className="mb-4 rounded-lg bg-within-soft p-3 text-within">
          You are signed out.
        </p>
      )}
      {actionData?.formError && (
        <p role="alert" className="mb-4 rounded-lg bg-out-soft p-3 font-semibold text-out">
          {actionData.formError}
        </p>
      )}
      <Form method="post" className="space-y-5" noValidate>
        <Field
          label="Email"
          name="email"
          type="email"
          autoComplete="username"
          defaultValue={actionData?.email}
          error={errors.email}
          required
        />
        <Field label="Password" name="password" type="password" autoComplete="current-password" error={errors.password} required />
        {next && <input type="hidden" name="next" value={next} />}
        <button type="submit" className="btn-primary w-full" disabled={busy}>
          {busy ? "Signing in…" : "Sign in"}
        </button>
      </Form>
      <p className="mt-6">
        <Link to="/forgot-password" className="inline-flex min-h-11 items-center font-semibold">
          Forgot your password?
        </Link>
      </p>
    </main>
  );
}
