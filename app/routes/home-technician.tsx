import { NotYet } from "~/components/Placeholder";
import { requireRole } from "~/lib/auth.server";
import type { Route } from "./+types/home-technician";

export const meta: Route.MetaFunction = () => [{ title: "My calls · Cluepath" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireRole(request, ["technician"]);
  return { firstName: user.name.split(" ")[0] };
}

export default function TechnicianHome({ loaderData }: Route.ComponentProps) {
  return (
    <div className="space-y-4">
      <h1 className="text-2xl font-bold">My calls</h1>
      <p className="text-ink-soft">Good to see you, {loaderData.firstName}. Calls assigned to you will be listed here.</p>
      <NotYet title="Assigned service calls">
        Service calls, the step-by-step runner and service reports arrive with the field-runs work. Until then the
        Equipment tab lists your shop's units.
      </NotYet>
    </div>
  );
}
