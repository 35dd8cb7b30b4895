import { data } from "react-router";

/** API paths and JSON callers get the JSON error shape; everything else a page error. */
export function wantsJson(request: Request): boolean {
  const url = new URL(request.url);
  if (url.pathname === "/api" || url.pathname.startsWith("/api/")) return true;
  const accept = request.headers.get("Accept") ?? "";
  const contentType = request.headers.get("Content-Type") ?? "";
  return (
    accept.includes("application/json") ||
    contentType.includes("application/json")
  );
}

/** A refusal from middleware: returned as a JSON response, or thrown as a page error. */
export function refuse(
  request: Request,
  status: number,
  code: string,
  message: string,
): Response {
  if (wantsJson(request))
    return Response.json({ error: { code, message } }, { status });
  throw data(message, { status });
}
