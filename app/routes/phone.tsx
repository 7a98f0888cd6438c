// /phone — what is kept on this phone for working without signal: the runs in progress, today's
// calls and the procedures to start one offline, and what is waiting to be sent. Full screen, like
// the runner. The service worker keeps this page's empty shell and opens it whenever a page cannot
// be reached with no signal.
import { OnPhone } from "~/components/runner/offline/OnPhone";
import { requireUser } from "~/lib/auth.server";
import { isShellRequest } from "~/lib/field-kit";
import { page } from "~/lib/route.server";
import type { Route } from "./+types/phone";

export const meta: Route.MetaFunction = () => [{ title: "On this phone · Cluepath" }];

export const loader = page(async ({ request }: Route.LoaderArgs) => {
  if (isShellRequest(request)) return { user: null };
  const user = await requireUser(request);
  return { user: { id: user.ctx.userId, name: user.name, role: user.role } };
});

export default function PhonePage({ loaderData }: Route.ComponentProps) {
  return <OnPhone signedIn={loaderData.user} />;
}
