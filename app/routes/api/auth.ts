import { auth } from "~/.server/auth";
import type { Route } from "./+types/auth";

// better-auth's own endpoints (sign-in, sign-out, session); it checks origins itself.
export async function loader({ request }: Route.LoaderArgs) {
  return auth().handler(request);
}

export async function action({ request }: Route.ActionArgs) {
  return auth().handler(request);
}
