import { redirect } from "react-router";
import { getUser } from "~/lib/auth.server";
import { HOME_PATH } from "~/lib/roles";
import type { Route } from "./+types/_index";

export async function loader({ request }: Route.LoaderArgs) {
  const user = await getUser(request);
  throw redirect(user ? HOME_PATH[user.role] : "/login");
}
