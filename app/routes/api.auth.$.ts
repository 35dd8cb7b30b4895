import { auth } from "~/.server/auth";
import { apiError } from "~/.server/guard";
import type { Route } from "./+types/api.auth.$";

/**
 * The few better-auth endpoints a browser may call directly. Everything that
 * checks a password or sends mail goes through Patina's own pages, where the
 * throttling is; the library's endpoints for it are not exposed.
 */
const EXPOSED = new Set(["get-session", "sign-out", "ok"]);

function exposed(params: Route.LoaderArgs["params"] | Route.ActionArgs["params"]): boolean {
  return EXPOSED.has(params["*"] ?? "");
}

export async function loader({ request, params }: Route.LoaderArgs) {
  if (!exposed(params)) throw apiError(404, "not_found", "No such endpoint.");
  return auth().handler(request);
}

export async function action({ request, params }: Route.ActionArgs) {
  if (!exposed(params)) throw apiError(404, "not_found", "No such endpoint; sign in on the sign-in page.");
  return auth().handler(request);
}
