import { redirect } from "react-router";
import { auth } from "~/.server/auth";
import type { Route } from "./+types/sign-out";

export async function loader() {
  return redirect("/");
}

export async function action({ request }: Route.ActionArgs) {
  const response = await auth().api.signOut({ headers: request.headers, asResponse: true });
  const headers = new Headers();
  for (const cookie of response.headers.getSetCookie()) headers.append("Set-Cookie", cookie);
  return redirect("/sign-in", { headers });
}
