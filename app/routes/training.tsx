import { NotYet } from "~/components/Placeholder";
import { requireUser } from "~/lib/auth.server";
import { authorize } from "~/lib/policy";
import { page } from "~/lib/route.server";
import type { Route } from "./+types/training";

export const meta: Route.MetaFunction = () => [{ title: "Training · Cluepath" }];

export const loader = page(async ({ request }: Route.LoaderArgs) => {
  const { ctx } = await requireUser(request);
  // Nothing to load yet: the page only says what is coming, to trainers.
  authorize(ctx, "training.view");
  return null;
});

export default function TrainerHome() {
  return (
    <div className="space-y-4">
      <h1 className="text-2xl font-bold">Training</h1>
      <p className="text-ink-soft">Set practice faults for trainees and review their runs against the right path.</p>
      <NotYet title="Practice scenarios">Practice scenarios with a hidden fault and scripted readings will be set up here.</NotYet>
      <NotYet title="Trainee run reviews">Each trainee run, with its first wrong turn and misjudged readings, will be listed here.</NotYet>
    </div>
  );
}
