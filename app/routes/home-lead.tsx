import { NotYet } from "~/components/Placeholder";
import { requireRole } from "~/lib/auth.server";
import type { Route } from "./+types/home-lead";

export const meta: Route.MetaFunction = () => [{ title: "Authoring · Cluepath" }];

export async function loader({ request }: Route.LoaderArgs) {
  await requireRole(request, ["lead"]);
  return null;
}

export default function LeadHome() {
  return (
    <div className="space-y-4">
      <h1 className="text-2xl font-bold">Authoring</h1>
      <p className="text-ink-soft">Write and publish the shop's diagnostic trees, and pick up calls that technicians hand over.</p>
      <NotYet title="Tree library and editor">The tree library, graph editor, versions and publishing arrive with the authoring work.</NotYet>
      <NotYet title="Handed-over calls">Calls a technician escalates to a lead will be listed here.</NotYet>
    </div>
  );
}
