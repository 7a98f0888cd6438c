import { Form, redirect } from "react-router";
import { z } from "zod";
import { Field } from "~/components/Field";
import { clientAddress } from "~/lib/http.server";
import { ROLE_LABEL } from "~/lib/roles";
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

const Join = z.object({ name: z.string().trim().max(120, "Keep your name under 120 characters.").optional(), password: z.string({ message: "Enter a password." }) });

export const action = form(async ({ request, params, context }: Route.ActionArgs) => {
  const input = await readForm(request, Join);
  const { shopName } = await acceptInvitation(params.token, input, { address: clientAddress(context) });
  return redirect(`/login?joined=${encodeURIComponent(shopName)}`);
});

export default function Invite({ loaderData, actionData }: Route.ComponentProps) {
  const inv = loaderData.invitation;
  const errors = actionData?.errors ?? {};
  const formError = actionData && Object.keys(errors).length === 0 ? actionData.message : undefined;
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
          {formError && (
            <p role="alert" className="mt-4 rounded-lg bg-out-soft p-3 font-semibold text-out">
              {formError}
            </p>
          )}
          <Form method="post" className="mt-6 space-y-5" noValidate>
            {inv.hasAccount ? (
              <Field label="Password of your existing account" name="password" type="password" autoComplete="current-password" error={errors.password} />
            ) : (
              <>
                <Field label="Your name" name="name" autoComplete="name" defaultValue={actionData?.values.name} error={errors.name} />
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
