import { handleAuth } from "~/lib/auth.server";
import { clientAddress } from "~/lib/http.server";
import type { Route } from "./+types/auth.$";

export function loader({ request, context }: Route.LoaderArgs) {
  return handleAuth(request, clientAddress(context));
}

export function action({ request, context }: Route.ActionArgs) {
  return handleAuth(request, clientAddress(context));
}
