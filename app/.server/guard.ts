import { and, asc, eq } from "drizzle-orm";
import { data, redirect } from "react-router";
import { type Area, AREA_ROLES, type RoleName } from "~/lib/roles";
import { auth } from "./auth";
import { db } from "./db/client";
import { companies, memberships, routes, routeTechnicians } from "./db/schema";

/**
 * What a signed-in member may see. Every query takes a Scope, so nothing can be
 * read without a company and, for technicians, without their routes.
 */
export type Scope = {
  userId: string;
  userName: string;
  email: string;
  companyId: number;
  companyName: string;
  timeZone: string;
  role: RoleName;
  /** null: every route of the company; otherwise the routes this member works. */
  routeIds: number[] | null;
};

type Refusal = { status: 401 | 403; code: "unauthenticated" | "forbidden"; message: string };

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

function roleRefusal(scope: Scope, allowed: readonly RoleName[]): Refusal | null {
  if (allowed.includes(scope.role)) return null;
  return {
    status: 403,
    code: "forbidden",
    message: `This part of Patina is for ${allowed.join(", ")}; you are signed in as ${scope.role}.`,
  };
}

/** For pages and form actions: redirects to sign-in, or throws a 403 page. */
export async function requireMember(request: Request, area: Area): Promise<Scope> {
  const scope = await resolveScope(request);
  if (isRefusal(scope)) {
    if (scope.status === 401) {
      const url = new URL(request.url);
      const next = url.pathname + url.search;
      throw redirect(next === "/" ? "/sign-in" : `/sign-in?next=${encodeURIComponent(next)}`);
    }
    throw data(scope.message, { status: scope.status });
  }
  const refusal = roleRefusal(scope, AREA_ROLES[area]);
  if (refusal) throw data(refusal.message, { status: refusal.status });
  return scope;
}

/** For JSON routes: the same checks, answered with the API's error shape. */
export async function requireApiMember(request: Request, area: Area): Promise<Scope> {
  const scope = await resolveScope(request);
  const refusal = isRefusal(scope) ? scope : roleRefusal(scope, AREA_ROLES[area]);
  if (refusal) throw apiError(refusal.status, refusal.code, refusal.message);
  return scope as Scope;
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
  | "unprocessable";

export function apiError(status: number, code: ApiErrorCode, message: string, field?: string): Response {
  return Response.json({ error: { code, message, ...(field ? { field } : {}) } }, { status });
}
