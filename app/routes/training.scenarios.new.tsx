// /training/scenarios/new and /training/scenarios/:scenarioId/edit — write a practice scenario on a
// published tree: the call as the trainee hears it, the hidden fault, and what they find at each
// step. Saved whatever the engine's check says; the scenario page shows the check.
import { Form, Link, redirect } from "react-router";
import { Field } from "~/components/Field";
import { SelectField, TextAreaField } from "~/components/FormFields";
import { WorldFields } from "~/components/training/WorldFields";
import { useFormState } from "~/components/useFormState";
import { requireUser } from "~/lib/auth.server";
import { form, page, readForm } from "~/lib/route.server";
import { worldToForm } from "~/lib/training";
import { createScenario, getScenario, scenarioForm, scenarioFormChoices, updateScenario } from "~/models/training/scenarios.server";
import type { Route } from "./+types/training.scenarios.new";

export const meta: Route.MetaFunction = ({ params }) => [{ title: `${params.scenarioId ? "Edit scenario" : "New scenario"} · Cluepath` }];
export const handle = { wide: true };

export const loader = page(async ({ request, params }: Route.LoaderArgs) => {
  const { ctx } = await requireUser(request);
  if (params.scenarioId) {
    const s = await getScenario(ctx, params.scenarioId);
    const { scenario } = s;
    return {
      trees: null,
      version: { treeId: scenario.treeId, number: scenario.versionNumber, title: scenario.treeTitle, tree: s.tree },
      editing: { id: scenario.id, name: scenario.name, locked: s.locked || Boolean(scenario.retiredAt) },
      values: {
        name: scenario.name,
        complaint: scenario.complaint,
        unitText: scenario.unitText,
        fault: scenario.fault,
        ...worldToForm(scenario.world),
      } as Record<string, string>,
    };
  }
  const treeId = new URL(request.url).searchParams.get("tree");
  const choices = await scenarioFormChoices(ctx, treeId);
  return {
    trees: choices.trees,
    version: choices.version,
    editing: null,
    values: { name: "", complaint: "", unitText: "", fault: "" } as Record<string, string>,
  };
});

export const action = form(async ({ request, params }: Route.ActionArgs) => {
  const { ctx } = await requireUser(request, "training.write");
  const input = await readForm(request, scenarioForm);
  if (params.scenarioId) {
    await updateScenario(ctx, params.scenarioId, input);
    return redirect(`/training/scenarios/${params.scenarioId}`);
  }
  const treeId = new URL(request.url).searchParams.get("tree") ?? "";
  const { id } = await createScenario(ctx, treeId, input);
  return redirect(`/training/scenarios/${id}`);
});

export default function ScenarioForm({ loaderData, actionData }: Route.ComponentProps) {
  const { trees, version, editing } = loaderData;
  const { v, e, busy } = useFormState(loaderData.values, actionData);
  if (!version) {
    return (
      <div className="max-w-2xl space-y-4">
        <p>
          <Link to="/training">← Training</Link>
        </p>
        <h1 className="text-2xl font-bold">New practice scenario</h1>
        <Form method="get" className="card space-y-4">
          <SelectField
            label="Tree"
            name="tree"
            defaultValue=""
            hint="The scenario is written on the tree's newest published version and stays on it."
          >
            <option value="">Choose a published tree…</option>
            {(trees ?? []).map((t) => (
              <option key={t.treeId} value={t.treeId}>
                {t.title} (version {t.number})
              </option>
            ))}
          </SelectField>
          <button className="btn-primary">Continue</button>
        </Form>
      </div>
    );
  }
  return (
    <div className="space-y-4">
      <p>
        <Link to={editing ? `/training/scenarios/${editing.id}` : "/training"}>← {editing ? editing.name : "Training"}</Link>
      </p>
      <h1 className="text-2xl font-bold">{editing ? `Edit ‘${editing.name}’` : "New practice scenario"}</h1>
      <p className="text-ink-soft">
        On <strong>{version.title}</strong>, version {version.number}.
      </p>
      {editing?.locked && (
        <p role="alert" className="rounded-xl border-2 border-marginal bg-marginal-soft p-3 font-semibold">
          Practice runs have used this scenario, so it stays as they saw it. Copy it from its page to make a changed one.
        </p>
      )}
      {actionData && actionData.ok === false && !Object.keys(actionData.errors).length && (
        <p role="alert" className="field-error">
          {actionData.message}
        </p>
      )}
      <Form
        method="post"
        action={editing ? `/training/scenarios/${editing.id}/edit` : `/training/scenarios/new?tree=${version.treeId}`}
        className="space-y-4"
        noValidate
      >
        <section className="card grid gap-4 md:grid-cols-2" aria-labelledby="call-heading">
          <h2 id="call-heading" className="text-lg font-bold md:col-span-2">
            The call
          </h2>
          <Field
            label="Scenario name"
            name="name"
            defaultValue={v.name}
            error={e.name}
            hint="For you and the trainee, e.g. “Slow fan, weak capacitor”."
          />
          <Field
            label="The unit"
            name="unitText"
            defaultValue={v.unitText}
            error={e.unitText}
            hint="As the trainee finds it: make, model, where it stands."
          />
          <TextAreaField
            className="md:col-span-2"
            label="What the customer says"
            name="complaint"
            defaultValue={v.complaint}
            error={e.complaint}
            hint="The complaint in the customer's words."
          />
        </section>
        <WorldFields key={JSON.stringify(v)} tree={version.tree} initial={v} errors={e} faultError={e.fault} />
        <button className="btn-primary" disabled={busy || editing?.locked}>
          {editing ? "Save and check again" : "Save and check the scenario"}
        </button>
      </Form>
    </div>
  );
}
