import { data } from "react-router";
import { z } from "zod";

const positiveId = z.coerce.number().int().positive();

/** A numeric id from the URL, or a 404 page: a malformed id names nothing. */
export function idParam(params: Record<string, string | undefined>, name: string, what: string): number {
  const parsed = positiveId.safeParse(params[name]);
  if (!parsed.success) throw data(`That is not a ${what} address.`, { status: 404 });
  return parsed.data;
}

export function notFoundPage(message: string): never {
  throw data(message, { status: 404 });
}
