import { data } from "react-router";
import { plainPositiveInt } from "./strict-params";

/** A numeric id from the URL, or a 404 page: a malformed id names nothing. */
export function idParam(params: Record<string, string | undefined>, name: string, what: string): number {
  const id = plainPositiveInt(params[name]);
  if (id === null) throw data(`That is not a ${what} address.`, { status: 404 });
  return id;
}

export function notFoundPage(message: string): never {
  throw data(message, { status: 404 });
}
