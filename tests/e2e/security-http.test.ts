/**
 * Security over real HTTP, against the built server (the origin check, the
 * headers and `.data` requests exist only there): the access matrix generated
 * from app/routes.ts, cross-origin posts, headers, and a fuzz of parameters
 * and form bodies.
 */
import { readFileSync } from "node:fs";
import { sql } from "drizzle-orm";
import fc from "fast-check";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/.server/db/client";
import { products } from "~/.server/db/schema";
import { type Area, AREA_ROLES, type RoleName } from "~/lib/roles";
import routeConfig from "../../app/routes";
import { createCompany, createMember, type FixtureMember } from "../fixtures/company";
import { createRouteBook } from "../fixtures/route-book";
import { BROWSER_TEST_URL } from "../fixtures/server";

// ---------------------------------------------------------------- routes, from the route config

type ConfigEntry = {
  file: string;
  path?: string;
  index?: boolean;
  children?: ConfigEntry[];
};
type Leaf = {
  file: string;
  path: string;
  layout: boolean;
  hasLoader: boolean;
  hasAction: boolean;
  resource: boolean;
};

function leaves(entries: readonly ConfigEntry[], parent = ""): Leaf[] {
  return entries.flatMap((entry) => {
    const path = entry.path
      ? `${parent}/${entry.path}`.replace(/\/+/g, "/")
      : parent || "/";
    const source = readFileSync(`app/${entry.file}`, "utf8");
    const leaf: Leaf = {
      file: entry.file,
      path,
      layout: Boolean(entry.children),
      hasLoader: /export (async )?function loader\b|export const loader\b/.test(
        source,
      ),
      hasAction: /export (async )?function action\b|export const action\b/.test(
        source,
      ),
      resource: !/export default/.test(source),
    };
    return [
      leaf,
      ...(entry.children
        ? leaves(entry.children, entry.path ? path : parent)
        : []),
    ];
  });
}

const ROUTES = leaves(routeConfig as unknown as ConfigEntry[]);

/** What each route file is: who may open it, and which object its URL names. */
type Target = "list" | "poolA" | "sourceA" | "routeA" | "productA" | "absent";
type Spec =
  | { kind: "public" }
  | { kind: "layout" }
  | { kind: "sign-out" }
  | { kind: "auth-api" }
  | {
      kind: "area";
      area: Area;
      target: Target;
      postOnly?: boolean;
      actionArea?: Area;
    };

const area = (
  a: Area,
  target: Target = "list",
  extra: { postOnly?: boolean; actionArea?: Area } = {},
): Spec => ({
  kind: "area",
  area: a,
  target,
  ...extra,
});

const SPECS: Record<string, Spec> = {
  "routes/sign-in.tsx": { kind: "public" },
  "routes/sign-out.tsx": { kind: "sign-out" },
  "routes/invite.$token.tsx": { kind: "public" },
  "routes/forgot-password.tsx": { kind: "public" },
  "routes/reset-password.tsx": { kind: "public" },
  "routes/unsubscribe.$token.tsx": { kind: "public" },
  "routes/app-layout.tsx": { kind: "layout" },
  "routes/api-layout.ts": { kind: "layout" },
  "routes/_index.tsx": area("home"),
  "routes/team.tsx": area("team"),
  "routes/settings.tsx": area("settings"),
  "routes/visit.tsx": area("visit"),
  "routes/visit.$poolId.tsx": area("visit", "poolA"),
  "routes/pools.tsx": area("pools"),
  "routes/pools.new.tsx": area("routebookEdit"),
  "routes/pools.$poolId.tsx": area("pools", "poolA"),
  "routes/pools.$poolId.edit.tsx": area("routebookEdit", "poolA"),
  "routes/routes.tsx": area("routebook"),
  "routes/routes.new.tsx": area("routebookEdit"),
  "routes/routes.$routeId.edit.tsx": area("routebookEdit", "routeA"),
  "routes/sources.tsx": area("routebook"),
  "routes/sources.new.tsx": area("routebookEdit"),
  "routes/sources.health.tsx": area("sources"),
  "routes/sources.$sourceId.tsx": area("routebook", "sourceA", {
    actionArea: "routebookEdit",
  }), // logging a source test edits
  "routes/sources.$sourceId.edit.tsx": area("routebookEdit", "sourceA"),
  "routes/products.tsx": area("routebook"),
  "routes/products.new.tsx": area("routebookEdit"),
  "routes/products.$productId.edit.tsx": area("routebookEdit", "productA"),
  "routes/overview.tsx": area("overview"),
  "routes/risk.tsx": area("risk"),
  "routes/recurring.tsx": area("recurring"),
  "routes/outcomes.tsx": area("outcomes"),
  "routes/outlook.tsx": area("outlook"),
  "routes/imports.tsx": area("imports"),
  "routes/imports.new.tsx": area("imports"),
  "routes/imports.$uploadId.tsx": area("imports", "absent"),
  "routes/exports.tsx": area("exports"),
  "routes/team.invitations.tsx": area("team", "list", { postOnly: true }),
  "routes/mailbox.tsx": area("mailbox"),
  "routes/mailbox.$messageId.tsx": area("mailbox", "absent"),
  "routes/api.auth.$.ts": { kind: "auth-api" },
  "routes/api.summary.ts": area("home"),
  "routes/api.pools.$poolId.ts": area("pools", "poolA"),
  "routes/api.analytics.summary.ts": area("overview"),
  "routes/api.analytics.trend.ts": area("overview"),
  "routes/api.analytics.groups.ts": area("risk"),
  "routes/api.analytics.recurring.ts": area("recurring"),
  "routes/api.analytics.alerts.ts": area("sources"),
  "routes/api.analytics.sources.ts": area("sources"),
  "routes/api.analytics.outcomes.ts": area("outcomes"),
  "routes/api.analytics.ahead.ts": area("outlook"),
  "routes/api.analytics.pools.$poolId.series.ts": area("pools", "poolA"),
  "routes/api.analytics.pools.$poolId.evidence.ts": area("pools", "poolA"),
  "routes/api.imports.uploads.ts": area("imports", "list", { postOnly: true }),
  "routes/api.imports.$uploadId.ts": area("imports", "absent"),
  "routes/api.imports.$uploadId.refused[.csv].ts": area("imports", "absent"),
  "routes/api.exports.$dataset.ts": area("exports"),
};

// ---------------------------------------------------------------- two companies, with marker strings

type Who =
  "anonymous" | RoleName | "technician-off-route" | "other-company-owner";
const IDENTITIES: Who[] = [
  "anonymous",
  "owner",
  "manager",
  "technician",
  "analyst",
  "technician-off-route",
  "other-company-owner",
];

const A = {
  company: "Alphamarker Care",
  street: "1 Alphamarker Lane",
  well: "Alphamarker well",
  route: "Alphamarker loop",
  product: "Alphamarker pad",
};
const B = {
  company: "Betamarker Care",
  street: "2 Betamarker Lane",
  well: "Betamarker well",
  route: "Betamarker loop",
};
const ids = { poolA: 0, sourceA: 0, routeA: 0, productA: 0 };
const members = new Map<Who, FixtureMember | null>();

/** Strings a response to this identity must never carry. */
function hiddenFrom(who: Who): string[] {
  const a = Object.values(A);
  const b = Object.values(B);
  if (who === "anonymous") return [...a, ...b];
  if (who === "other-company-owner") return a;
  if (who === "technician-off-route") return [...b, A.street, A.well, A.route];
  return b;
}

beforeAll(async () => {
  const a = await createRouteBook({
    company: A.company,
    routes: { main: A.route, second: { name: "Second loop", weekdays: "2" } },
    sources: { well: { name: A.well, kind: "shared_well" } },
    pools: {
      main: { route: "main", accountCode: "AM-1", street: A.street, source: "well" },
      second: { route: "second", accountCode: "AM-2", street: "3 Quiet Close" },
    },
    members: {
      owner: "owner",
      manager: "manager",
      analyst: "analyst",
      technician: { role: "technician", routes: ["main"] },
      offRoute: { role: "technician", routes: ["second"] },
    },
  });
  ids.routeA = a.route.main;
  ids.sourceA = a.source.well;
  ids.poolA = a.pool.main;
  const [product] = await db()
    .insert(products)
    .values({ companyId: a.companyId, name: A.product, category: "sequestrant" })
    .$returningId();
  ids.productA = product!.id;

  const b = await createRouteBook({
    company: B.company,
    routes: { main: B.route },
    sources: { well: { name: B.well, kind: "shared_well" } },
    pools: { main: { route: "main", accountCode: "BM-1", street: B.street, source: "well" } },
    members: { owner: "owner" },
  });

  members.set("anonymous", null);
  for (const role of ["owner", "manager", "analyst", "technician"] as const)
    members.set(role, a.member[role]);
  members.set("technician-off-route", a.member.offRoute);
  members.set("other-company-owner", b.member.owner);
});

// ---------------------------------------------------------------- requests

function urlOf(leaf: Leaf, spec: Spec): string {
  const target = spec.kind === "area" ? spec.target : "list";
  const value = (name: string): string => {
    if (name === "*") return "get-session";
    if (name === "dataset") return "pools.csv";
    if (name === "token") return "x".repeat(32);
    if (name === "uploadId") return "00000000-0000-4000-8000-000000000000";
    if (target === "absent") return "999999999";
    if (name === "poolId") return String(ids.poolA);
    if (name === "sourceId") return String(ids.sourceA);
    if (name === "routeId") return String(ids.routeA);
    if (name === "productId") return String(ids.productA);
    return "999999999";
  };
  return leaf.path.replace(/:(\w+)|\*/g, (whole, name: string | undefined) =>
    value(name ?? "*"),
  );
}

async function send(who: Who, path: string, init: RequestInit = {}) {
  const headers = new Headers(init.headers);
  const member = members.get(who);
  if (member) headers.set("Cookie", member.cookie);
  const response = await fetch(`${BROWSER_TEST_URL}${path}`, {
    ...init,
    headers,
    redirect: "manual",
  });
  return {
    status: response.status,
    location: response.headers.get("Location"),
    headers: response.headers,
    body: await response.text(),
  };
}

const samePost = (
  body: URLSearchParams | string = new URLSearchParams({ intent: "probe" }),
): RequestInit => ({
  method: "POST",
  body,
  headers: {
    Origin: BROWSER_TEST_URL,
    "Content-Type": "application/x-www-form-urlencoded",
  },
});

function roleOf(who: Who): RoleName | null {
  if (who === "anonymous") return null;
  if (who === "technician-off-route") return "technician";
  if (who === "other-company-owner") return "owner";
  return who;
}

/** Whether this identity sees the object the URL names. */
function sees(who: Who, target: Target): boolean {
  if (target === "list") return true;
  if (target === "absent") return false;
  if (who === "other-company-owner") return false;
  if (who === "technician-off-route")
    return target !== "poolA" && target !== "sourceA";
  return true;
}

type Expectation = number[];
function expectedStatus(
  spec: Spec,
  who: Who,
  api: boolean,
  method: "GET" | "POST",
): Expectation {
  if (spec.kind !== "area")
    throw new Error("only area routes have a computed expectation");
  const role = roleOf(who);
  // The layouts' middleware asks for a session before any route code runs.
  if (role === null) return api ? [401] : [302];
  // A POST-only route answers a signed-in GET with 405 before its role check: the method names nothing.
  if (method === "GET" && spec.postOnly) return [405];
  const areaOfRequest =
    method === "POST" ? (spec.actionArea ?? spec.area) : spec.area;
  if (!(AREA_ROLES[areaOfRequest] as readonly RoleName[]).includes(role))
    return [403];
  // An action reads its form before it looks the object up, so an empty probe may be refused
  // as input (400) first; either way nothing is read or stored, and no body may carry a marker.
  if (!sees(who, spec.target)) return method === "POST" ? [400, 404] : [404];
  // Allowed: a GET reads; a probe POST with no real fields is refused as input, never stored.
  return method === "GET" ? [200] : [400, 404, 409, 422];
}

type Row = {
  route: string;
  who: Who;
  request: string;
  status: number;
  expected: number[];
};

describe("access matrix generated from app/routes.ts", () => {
  it("classifies every route in the route config", () => {
    const unclassified = ROUTES.map((r) => r.file).filter(
      (file) => !(file in SPECS),
    );
    expect(
      unclassified,
      "add these routes to SPECS with their area and target",
    ).toEqual([]);
    const stale = Object.keys(SPECS).filter(
      (file) => !ROUTES.some((r) => r.file === file),
    );
    expect(stale).toEqual([]);
  });

  it("every page, .data request, action and API route answers each identity as its role and scope allow, and leaks nothing", async () => {
    const rows: Row[] = [];
    const leaks: string[] = [];
    let requests = 0;
    let routesCovered = 0;
    const check = async (
      leaf: Leaf,
      who: Who,
      label: string,
      path: string,
      init: RequestInit,
      expected: number[],
    ) => {
      const answer = await send(who, path, init);
      requests++;
      rows.push({
        route: leaf.path,
        who,
        request: label,
        status: answer.status,
        expected,
      });
      for (const marker of hiddenFrom(who)) {
        if (answer.body.includes(marker))
          leaks.push(`${label} ${path} as ${who} carries "${marker}"`);
      }
      if (SPECS[leaf.file]?.kind === "area" && answer.status === 302) {
        expect(answer.location, `${label} ${path} as ${who}`).toMatch(
          /^\/sign-in/,
        );
      }
    };
    for (const leaf of ROUTES) {
      const spec = SPECS[leaf.file];
      if (!spec || spec.kind === "layout" || spec.kind === "sign-out") continue;
      routesCovered++;
      const path = urlOf(leaf, spec);
      const api = leaf.path.startsWith("/api/");
      for (const who of IDENTITIES) {
        const probePost = (expected: number[]) =>
          check(leaf, who, "action", path, samePost(), expected);
        if (spec.kind === "public") {
          // Open to all; signed-in members may be sent on. Only a 500 or a leak fails.
          if (leaf.hasLoader || !leaf.resource)
            await check(leaf, who, "page", path, {}, [200, 302, 400, 404, 410]);
          if (leaf.hasAction) await probePost([302, 400, 401, 404, 410, 429]);
          continue;
        }
        if (spec.kind === "auth-api") {
          await check(leaf, who, "api", "/api/auth/get-session", {}, [200]);
          await check(
            leaf,
            who,
            "api",
            "/api/auth/sign-in/email",
            {
              ...samePost(
                JSON.stringify({ email: "a@b.example", password: "x" }),
              ),
              headers: {
                Origin: BROWSER_TEST_URL,
                "Content-Type": "application/json",
              },
            },
            [404],
          );
          continue;
        }
        if (leaf.hasLoader || !leaf.resource) {
          await check(
            leaf,
            who,
            api ? "api" : "page",
            path,
            {},
            expectedStatus(spec, who, api, "GET"),
          );
          if (!leaf.resource) {
            const dataPath = path === "/" ? "/_.data" : `${path}.data`;
            // A redirect on a .data request is answered 202 with the target in the body.
            const expected = expectedStatus(spec, who, api, "GET").map((s) =>
              s === 302 ? 202 : s,
            );
            await check(leaf, who, ".data", dataPath, {}, expected);
          }
        }
        if (leaf.hasAction)
          await probePost(expectedStatus(spec, who, api, "POST"));
      }
    }
    const wrong = rows
      .filter((r) => !r.expected.includes(r.status))
      .map(
        (r) =>
          `${r.request} ${r.route} as ${r.who}: ${r.status}, expected ${r.expected.join("/")}`,
      );
    console.log(
      `[security] access matrix: ${routesCovered} routes x ${IDENTITIES.length} identities, ${requests} requests`,
    );
    expect(wrong).toEqual([]);
    expect(leaks).toEqual([]);
    expect(rows.some((r) => r.status >= 500)).toBe(false);
  });
});

// ---------------------------------------------------------------- cross-origin posts

async function rowCounts(): Promise<Record<string, number>> {
  const [tables] = (await db().execute(
    sql`SELECT table_name AS name FROM information_schema.tables WHERE table_schema = DATABASE() AND table_name NOT LIKE '\\_\\_%'`,
  )) as unknown as [Array<{ name: string }>];
  const counts: Record<string, number> = {};
  for (const { name } of tables) {
    const [[row]] = (await db().execute(
      sql.raw(`SELECT COUNT(*) AS n FROM \`${name}\``),
    )) as unknown as [[{ n: number }]];
    counts[name] = Number(row!.n);
  }
  return counts;
}

describe("cross-origin requests", () => {
  it("a POST from another origin to every mutating route is refused with 403 and stores nothing", async () => {
    const mutating = ROUTES.filter((r) => r.hasAction);
    const before = await rowCounts();
    const refused: string[] = [];
    const origins = [
      "https://evil.example",
      "null",
      "http://localhost.evil.example",
    ];
    let requests = 0;
    for (const leaf of mutating) {
      const path =
        leaf.file === "routes/api.auth.$.ts"
          ? "/api/auth/sign-out"
          : urlOf(leaf, SPECS[leaf.file]!);
      // A body an owner's own form could have sent: an invitation is the worst case.
      const body = new URLSearchParams({
        intent: "invite",
        email: "intruder@evil.example",
        role: "owner",
        name: "Intruder",
      });
      for (const origin of origins) {
        const answer = await send("owner", path, {
          method: "POST",
          body,
          headers: {
            Origin: origin,
            "Content-Type": "application/x-www-form-urlencoded",
          },
        });
        requests++;
        if (answer.status !== 403)
          refused.push(`${path} from ${origin}: ${answer.status}`);
      }
      // Sec-Fetch-Site without Origin (older browsers on some requests).
      const viaFetchSite = await send("owner", path, {
        method: "POST",
        body,
        headers: {
          "Sec-Fetch-Site": "cross-site",
          "Content-Type": "application/x-www-form-urlencoded",
        },
      });
      requests++;
      if (viaFetchSite.status !== 403)
        refused.push(
          `${path} with Sec-Fetch-Site cross-site: ${viaFetchSite.status}`,
        );
      // A JSON caller gets the JSON error shape.
      const json = await send("owner", path, {
        method: "POST",
        body: "{}",
        headers: {
          Origin: "https://evil.example",
          "Content-Type": "application/json",
          Accept: "application/json",
        },
      });
      requests++;
      expect(JSON.parse(json.body)).toMatchObject({
        error: {
          code: "cross_site_request",
          message: expect.stringContaining("https://evil.example"),
        },
      });
    }
    console.log(
      `[security] cross-origin: ${mutating.length} mutating routes, ${requests} requests`,
    );
    expect(refused).toEqual([]);
    expect(await rowCounts()).toEqual(before);
    // The owner is still signed in: sign-out from another origin did nothing.
    expect((await send("owner", "/team")).status).toBe(200);
  });

  it("the same POST from Patina's own origin is accepted", async () => {
    const member = await createMember(
      await createCompany("Own origin company"),
      "owner",
    );
    const response = await fetch(`${BROWSER_TEST_URL}/team/invitations`, {
      method: "POST",
      redirect: "manual",
      body: new URLSearchParams({
        intent: "invite",
        email: `new-${Date.now()}@fixture.example`,
        role: "technician",
      }),
      headers: {
        Cookie: member.cookie,
        Origin: BROWSER_TEST_URL,
        "Content-Type": "application/x-www-form-urlencoded",
      },
    });
    expect(response.status).toBe(200);
  });
});

// ---------------------------------------------------------------- headers

const REQUIRED_HEADERS: Record<string, RegExp> = {
  "content-security-policy":
    /default-src 'self'; script-src 'self' 'nonce-[A-Za-z0-9+/=]+'.*frame-ancestors 'none'/,
  "x-frame-options": /^DENY$/,
  "x-content-type-options": /^nosniff$/,
  "referrer-policy": /^strict-origin-when-cross-origin$/,
};

describe("security headers", () => {
  it.each([
    ["a page", "owner", "/pools"],
    ["the sign-in page", "anonymous", "/sign-in"],
    ["a .data request", "owner", "/pools.data"],
    ["the JSON API", "owner", "/api/summary"],
    ["a JSON error", "anonymous", "/api/summary"],
    ["a CSV export", "owner", "/api/exports/pools.csv"],
    ["a missing page", "owner", "/no-such-page"],
    ["a refused page", "analyst", "/settings"],
  ] as const)("on %s", async (_what, who, path) => {
    const answer = await send(who, path);
    for (const [name, pattern] of Object.entries(REQUIRED_HEADERS))
      expect(answer.headers.get(name), name).toMatch(pattern);
    // Served over http here, so no HSTS (it is only sent when PATINA_URL is https).
    expect(answer.headers.get("strict-transport-security")).toBeNull();
  });

  it("every inline script of a page carries this response's nonce, and the nonce changes per response", async () => {
    const first = await send("owner", "/pools");
    const nonce = /'nonce-([^']+)'/.exec(
      first.headers.get("content-security-policy")!,
    )![1];
    const scripts = [...first.body.matchAll(/<script\b[^>]*>/g)].map(
      (m) => m[0],
    );
    expect(scripts.length).toBeGreaterThan(0);
    for (const tag of scripts) expect(tag).toContain(`nonce="${nonce}"`);
    const second = await send("owner", "/pools");
    expect(second.headers.get("content-security-policy")).not.toContain(nonce);
  });
});

// ---------------------------------------------------------------- bad bodies

describe("malformed bodies and wrong methods are 4xx, never 500", () => {
  it.each([
    [
      "malformed multipart to a page action",
      "/settings",
      "multipart/form-data; boundary=xyz",
      '--xyz\r\nContent-Disposition: form-data; name="a"\r\n\r\nno end',
      400,
    ],
    [
      "multipart without a boundary",
      "/pools/new",
      "multipart/form-data",
      "a=1",
      400,
    ],
    [
      "JSON to a page action",
      "/settings",
      "application/json",
      '{"timeZone":',
      415,
    ],
    ["text to a page action", "/routes/new", "text/plain", "name=x", 415],
    [
      "XML to a resource route's action",
      "/team/invitations",
      "application/xml",
      "<a/>",
      415,
    ],
    [
      "malformed multipart to the upload API",
      "/api/imports/uploads",
      "multipart/form-data; boundary=xyz",
      "--xyz\r\nbroken",
      400,
    ],
  ])("%s", async (_what, path, contentType, body, status) => {
    const answer = await send("owner", path, {
      method: "POST",
      body,
      headers: { Origin: BROWSER_TEST_URL, "Content-Type": contentType },
    });
    expect(answer.status).toBe(status);
    expect(answer.body).not.toMatch(/Unexpected Server Error|\n\s+at /);
  });

  it.each([
    ["/api/imports/uploads", 405],
    ["/team/invitations", 405],
  ])("GET %s answers %i", async (path, status) => {
    const answer = await send("owner", path, {
      headers: { Accept: "application/json" },
    });
    expect(answer.status).toBe(status);
  });
});

// ---------------------------------------------------------------- fuzz

const LEAK =
  /\n\s+at |node_modules|SELECT |INSERT |UPDATE |ER_[A-Z_]+|sqlMessage|You have an error in your SQL/;

describe("fuzz: JSON API parameters and form bodies", () => {
  const apiLeaves = ROUTES.filter(
    (r) =>
      r.path.startsWith("/api/") &&
      r.hasLoader &&
      SPECS[r.file]?.kind === "area",
  );
  const formLeaves = ROUTES.filter(
    (r) => r.hasAction && SPECS[r.file]?.kind === "area",
  );
  const nasty = fc.oneof(
    fc.string(),
    fc.constantFrom(
      "1e2",
      "0x10",
      "1.0",
      "-1",
      "0",
      "2024-02-30",
      "9999-99-99",
      "' OR 1=1 --",
      "%00",
      "NaN",
      "Infinity",
      "[]",
      "{}",
      "a".repeat(5000),
      "𝔭𝔞𝔱",
      "null",
    ),
    fc.integer().map(String),
    fc.double().map(String),
    fc.date({ noInvalidDate: true }).map((d) => d.toISOString()),
  );
  const PARAM_NAMES = [
    "from",
    "to",
    "route",
    "metal",
    "grouping",
    "window",
    "copperElevated",
    "ironClear",
    "days",
    "arm",
    "page",
    "sort",
    "dir",
    "q",
    "poolId",
    "format",
  ];

  it("API parameters: no 500, no stack trace, no SQL text", async () => {
    let requests = 0;
    await fc.assert(
      fc.asyncProperty(
        fc.constantFrom(...apiLeaves),
        fc.dictionary(fc.constantFrom(...PARAM_NAMES), nasty, { maxKeys: 4 }),
        nasty,
        async (leaf, query, pathValue) => {
          const path = leaf.path.replace(
            /:(\w+)/g,
            () => encodeURIComponent(pathValue) || "x",
          );
          const answer = await send(
            "owner",
            `${path}?${new URLSearchParams(query)}`,
          );
          requests++;
          return answer.status < 500 && !LEAK.test(answer.body);
        },
      ),
      { numRuns: 250, seed: 20261202 },
    );
    console.log(
      `[security] fuzz: ${requests} API requests over ${apiLeaves.length} endpoints`,
    );
  });

  it("form bodies: no 500, no stack trace, no SQL text, as owner from the right origin", async () => {
    let requests = 0;
    await fc.assert(
      fc.asyncProperty(
        fc.constantFrom(...formLeaves),
        fc.dictionary(
          fc.constantFrom(
            "intent",
            "name",
            "email",
            "role",
            "kind",
            "volumeLitres",
            "routeId",
            "fillSourceId",
            "sampledAt",
            "ph",
            "freeChlorine",
            "copper",
            "timeZone",
            "batchId",
            "invitationId",
            "serviceWeekdays",
            "active",
            "password",
          ),
          nasty,
          { maxKeys: 6 },
        ),
        async (leaf, fields) => {
          const answer = await send(
            "owner",
            urlOf(leaf, SPECS[leaf.file]!),
            samePost(new URLSearchParams(fields)),
          );
          requests++;
          return answer.status < 500 && !LEAK.test(answer.body);
        },
      ),
      { numRuns: 250, seed: 20261203 },
    );
    console.log(
      `[security] fuzz: ${requests} form posts over ${formLeaves.length} actions`,
    );
  });
});

// ---------------------------------------------------------------- sign-out last: it ends sessions

describe("sign-out", () => {
  it("signs each identity out, and its cookie stops working", async () => {
    for (const who of IDENTITIES) {
      const answer = await send(who, "/sign-out", samePost());
      expect(answer.status, who).toBe(302);
    }
    expect((await send("owner", "/pools")).status).toBe(302);
  });
});
