import { NotYet } from "~/components/Placeholder";
import { requireRole } from "~/lib/auth.server";
import type { Route } from "./+types/training";

export const meta: Route.MetaFunction = () => [{ title: "Training · Cluepath" }];

export async function loader({ request }: Route.LoaderArgs) {
  await requireRole(request, ["trainer"]);
  return null;
}

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
