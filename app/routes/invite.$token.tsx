import { data, Form, redirect } from "react-router";
import { z } from "zod";
import { Field } from "~/components/Field";
import { passwordProblem } from "~/lib/password.server";
import { ROLE_LABEL } from "~/lib/roles";
import { acceptInvitation, findInvitation } from "~/models/people.server";
import type { Route } from "./+types/invite.$token";

export const meta: Route.MetaFunction = () => [{ title: "Join a shop · Cluepath" }];

export async function loader({ params }: Route.LoaderArgs) {
  const inv = await findInvitation(params.token);
  if (!inv) return { invitation: null };
  return { invitation: { email: inv.email, role: inv.role, shopName: inv.shopName, hasAccount: inv.hasAccount } };
}

export async function action({ request, params }: Route.ActionArgs) {
  const inv = await findInvitation(params.token);
  if (!inv) return data({ errors: { form: "This invitation has expired, was withdrawn, or was already used." } as Record<string, string>, name: "" }, { status: 410 });
  const raw = Object.fromEntries(await request.formData());
  const parsed = z.object({ name: z.string().trim().max(120).optional(), password: z.string() }).safeParse(raw);
  const name = typeof raw.name === "string" ? raw.name : "";
  if (!parsed.success) return data({ errors: { password: "Enter a password." } as Record<string, string>, name }, { status: 400 });
  const errors: Record<string, string> = {};
  if (!inv.hasAccount) {
    if (!parsed.data.name) errors.name = "Enter your name as customers should see it on reports.";
    const problem = passwordProblem(parsed.data.password, inv.email);
    if (problem) errors.password = problem;
  }
  if (Object.keys(errors).length) return data({ errors, name }, { status: 400 });
  const result = await acceptInvitation(params.token, parsed.data);
  if (!result.ok) return data({ errors: { [result.field === "token" ? "form" : "password"]: result.message } as Record<string, string>, name }, { status: 400 });
  throw redirect(`/login?joined=${encodeURIComponent(inv.shopName)}`);
}

export default function Invite({ loaderData, actionData }: Route.ComponentProps) {
  const inv = loaderData.invitation;
  const errors = actionData?.errors ?? {};
  return (
    <main className="mx-auto max-w-md px-5 py-10">
      <p className="mb-6 text-3xl font-bold tracking-tight">
        Clue<span className="text-copper">path</span>
      </p>
      {!inv ? (
        <>
          <h1 className="text-2xl font-bold">This invitation can't be used</h1>
          <p className="mt-2 text-ink-soft">It has expired, was withdrawn, or was already used. Ask your shop owner for a new one.</p>
        </>
      ) : (
        <>
          <h1 className="text-2xl font-bold">Join {inv.shopName}</h1>
          <p className="mt-1 text-ink-soft">
            You are invited as <strong>{ROLE_LABEL[inv.role]}</strong> with the e-mail {inv.email}.
          </p>
          {errors.form && (
            <p role="alert" className="mt-4 rounded-lg bg-out-soft p-3 font-semibold text-out">
              {errors.form}
            </p>
          )}
          <Form method="post" className="mt-6 space-y-5" noValidate>
            {inv.hasAccount ? (
              <Field label="Password of your existing account" name="password" type="password" autoComplete="current-password" error={errors.password} />
            ) : (
              <>
                <Field label="Your name" name="name" autoComplete="name" defaultValue={actionData?.name} error={errors.name} />
                <Field
                  label="Choose a password"
                  name="password"
                  type="password"
                  autoComplete="new-password"
                  hint="At least 8 characters; 15 or more is better. A few unrelated words work well."
                  error={errors.password}
                />
              </>
            )}
            <button className="btn-primary w-full">Join the shop</button>
          </Form>
        </>
      )}
    </main>
  );
}
