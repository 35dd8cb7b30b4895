import { and, asc, eq } from "drizzle-orm";
import { createContext, data, type MiddlewareFunction, redirect, type RouterContextProvider } from "react-router";
import { type Area, AREA_ROLES, type RoleName } from "~/lib/roles";
import { auth } from "./auth";
import { db } from "./db/client";
import { companies, memberships, routes, routeTechnicians } from "./db/schema";
import type { Scope } from "./scope";

type Refusal = { status: 401 | 403; code: "unauthenticated" | "forbidden"; message: string };

/** How refusals are answered: pages redirect or show an error page, JSON routes answer in the API's error shape. */
type Answer = "page" | "api";

/** What the member middleware leaves for the request's loaders and actions. */
type MemberContext = { scope: Scope; answer: Answer };

const memberContext = createContext<MemberContext>();

async function resolveScope(request: Request): Promise<Scope | Refusal> {
  const signedIn = await auth().api.getSession({ headers: request.headers });
  if (!signedIn) {
    return { status: 401, code: "unauthenticated", message: "Sign in to continue." };
  }
  const [membership] = await db()
    .select({
      companyId: memberships.companyId,
      role: memberships.role,
      companyName: companies.name,
      timeZone: companies.timeZone,
    })
    .from(memberships)
    .innerJoin(companies, eq(companies.id, memberships.companyId))
    .where(eq(memberships.userId, signedIn.user.id))
    .orderBy(asc(memberships.id))
    .limit(1);
  if (!membership) {
    return { status: 403, code: "forbidden", message: "Your account does not belong to a company yet." };
  }
  let routeIds: number[] | null = null;
  if (membership.role === "technician") {
    const rows = await db()
      .select({ id: routes.id })
      .from(routeTechnicians)
      .innerJoin(routes, eq(routes.id, routeTechnicians.routeId))
      .where(and(eq(routeTechnicians.userId, signedIn.user.id), eq(routes.companyId, membership.companyId)));
    routeIds = rows.map((r) => r.id);
  }
  return {
    userId: signedIn.user.id,
    userName: signedIn.user.name,
    email: signedIn.user.email,
    companyId: membership.companyId,
    companyName: membership.companyName,
    timeZone: membership.timeZone,
    role: membership.role,
    routeIds,
  };
}

function isRefusal(value: Scope | Refusal): value is Refusal {
  return "status" in value;
}

function refusalResponse(refusal: Refusal, answer: Answer, url: URL): Response | ReturnType<typeof data> {
  if (answer === "api") return apiError(refusal.status, refusal.code, refusal.message);
  if (refusal.status === 401) {
    const next = url.pathname + url.search;
    return redirect(next === "/" ? "/sign-in" : `/sign-in?next=${encodeURIComponent(next)}`);
  }
  return data(refusal.message, { status: refusal.status });
}

/**
 * Resolves the session, company, role and technician routes once per request
 * and puts them in the router context for every loader and action below.
 * Pages without a signed-in member redirect to sign-in (keeping where they
 * were going); a member without a company gets a 403 page.
 */
export const memberMiddleware: MiddlewareFunction<Response> = (args, next) => provideMember(args, "page", next);

/** The same for JSON routes, answering 401 and 403 in the API's error shape. */
export const apiMemberMiddleware: MiddlewareFunction<Response> = (args, next) => provideMember(args, "api", next);

async function provideMember(
  { request, url, context }: { request: Request; url: URL; context: Readonly<RouterContextProvider> },
  answer: Answer,
  next: () => Promise<Response>,
): Promise<Response> {
  const scope = await resolveScope(request);
  // `url`, not request.url: a data request's URL carries `.data`, the page to come back to does not.
  if (isRefusal(scope)) throw refusalResponse(scope, answer, url);
  context.set(memberContext, { scope, answer });
  return next();
}

/**
 * The member's scope, if their role opens the area; otherwise the 403 the
 * request's middleware chose (a page, or the API's error shape).
 */
export function requireArea(context: Readonly<RouterContextProvider>, area: Area): Scope {
  const { scope, answer } = context.get(memberContext);
  const allowed: readonly RoleName[] = AREA_ROLES[area];
  if (allowed.includes(scope.role)) return scope;
  const message = `This part of Patina is for ${allowed.join(", ")}; you are signed in as ${scope.role}.`;
  if (answer === "api") throw apiError(403, "forbidden", message);
  throw data(message, { status: 403 });
}

/** Signed-in user, if any, without demanding a company (sign-in page). */
export async function currentUser(request: Request) {
  const signedIn = await auth().api.getSession({ headers: request.headers });
  return signedIn?.user ?? null;
}

export type ApiErrorCode =
  | "unauthenticated"
  | "forbidden"
  | "not_found"
  | "invalid_parameter"
  | "payload_too_large"
  | "method_not_allowed"
  | "unprocessable"
  | "unavailable"
  | "busy"
  | "timeout";

export function apiError(status: number, code: ApiErrorCode, message: string, field?: string): Response {
  return Response.json({ error: { code, message, ...(field ? { field } : {}) } }, { status });
}
