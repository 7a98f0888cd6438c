import { redirect } from "react-router";
import { signOut } from "~/lib/auth.server";
import type { Route } from "./+types/logout";

// Sign-out changes state, so it is a POST only; a GET just goes home.
export function loader() {
  throw redirect("/");
}

export async function action({ request }: Route.ActionArgs) {
  throw redirect("/login?signedOut=1", { headers: await signOut(request) });
}
