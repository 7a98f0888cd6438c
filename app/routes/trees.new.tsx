import { Form, redirect, useNavigation } from "react-router";
import { z } from "zod";
import { Field } from "~/components/Field";
import { SelectField } from "~/components/FormFields";
import { CategoryOptions } from "~/components/TreeLinks";
import { TreeSchema } from "~/engine/schema";
import { requireUser } from "~/lib/auth.server";
import { authorize } from "~/lib/policy";
import { form, page, readForm } from "~/lib/route.server";
import { emptyTree } from "~/lib/tree-library";
import { createDraftTree } from "~/models/trees/drafts.server";
import type { Route } from "./+types/trees.new";

export const meta: Route.MetaFunction = () => [{ title: "New tree · Cluepath" }];

export const loader = page(async ({ request }: Route.LoaderArgs) => {
  const { ctx } = await requireUser(request);
  // A form only: the page is for those who may make the tree.
  authorize(ctx, "trees.author");
  return null;
});

// The engine's own rules for these fields, with messages for this form.
const NewTree = z.object({
  title: z
    .string()
    .trim()
    .min(1, "Give the tree a title, like “Fryer won't light”.")
    .max(200, "Keep the title under 200 characters.")
    .pipe(TreeSchema.shape.title),
  symptom: z
    .string()
    .trim()
    .min(1, "Say what the customer reports.")
    .max(300, "Keep the symptom under 300 characters.")
    .pipe(TreeSchema.shape.symptom),
  category: TreeSchema.shape.category,
});

export const action = form(async ({ request }: Route.ActionArgs) => {
  const { ctx } = await requireUser(request, "trees.author");
  const { treeId } = await createDraftTree(ctx, emptyTree(await readForm(request, NewTree)));
  return redirect(`/trees/${treeId}/edit`);
});

export default function NewTreePage({ actionData }: Route.ComponentProps) {
  const busy = useNavigation().state !== "idle";
  const v = actionData?.values ?? {};
  const e = actionData?.errors ?? {};
  return (
    <div className="space-y-4">
      <h1 className="text-2xl font-bold">New tree</h1>
      <p className="text-ink-soft">
        Start with what the customer reports. You add the questions, measurements and outcomes in the editor next.
      </p>
      <Form method="post" className="card space-y-4" noValidate>
        <Field label="Title" name="title" defaultValue={v.title} error={e.title} hint="What the tree diagnoses, as a lead would say it." />
        <SelectField label="Equipment category" name="category" defaultValue={v.category ?? "rotisserie"}>
          <CategoryOptions />
        </SelectField>
        <Field
          label="Symptom"
          name="symptom"
          defaultValue={v.symptom}
          error={e.symptom}
          hint="What the customer reports, in their words."
        />
        <button className="btn-primary" disabled={busy}>
          Create and open the editor
        </button>
      </Form>
    </div>
  );
}
