import type { ReactNode } from "react";
import { Form, Link } from "react-router";
import { requireArea } from "~/.server/guard";
import { stopsForWeekday } from "~/.server/routebook/queries/home-summary";
import { companyPreferences } from "~/.server/settings/queries/company-settings";
import { searchPools } from "~/.server/routebook/queries/pools";
import { type MetalMark, metalMarks } from "~/.server/visits/queries/metal-marks";
import { PageHeader } from "~/components/data-table";
import { KeptPagesNote, KeptVisitsPanel, NoSignalNotice } from "~/components/visit/kept-visits";
import { MetalBadge } from "~/components/visit/metal-badge";
import { formatDate, isoWeekdayIn, weekdayName } from "~/lib/format";
import { useKeptPages } from "~/lib/offline/keep-pages";
import { useKeptVisitSender } from "~/lib/offline/send-visit";
import { visitPagesFor } from "~/lib/offline/visit-pages";
import type { Route } from "./+types/visit";

export const meta: Route.MetaFunction = () => [{ title: "Log a visit · Patina" }];

export async function loader({ request, context }: Route.LoaderArgs) {
  const scope = requireArea(context, "visit");
  const q = (new URL(request.url).searchParams.get("q") ?? "").trim().slice(0, 100);
  // The route's weekday is the company's weekday, not the server's.
  const weekday = isoWeekdayIn(new Date(), scope.timeZone);
  const [stops, found, prefs] = await Promise.all([
    stopsForWeekday(scope, weekday),
    q ? searchPools(scope, q) : Promise.resolve([]),
    companyPreferences(scope),
  ]);
  const poolIds = [...new Set([...stops, ...found].map((p) => p.poolId))];
  const marks = await metalMarks(scope, poolIds, prefs.thresholds);
  return { weekday, stops, q, found, marks, timeZone: scope.timeZone, memberId: scope.userId };
}

type PoolChoice = { poolId: number; street: string; detail: string };

/** Pools to pick from, each a link to its visit form with its metal mark; `empty` says why there are none. */
function PoolChoices({ pools, marks, empty }: { pools: PoolChoice[]; marks: Record<number, MetalMark>; empty: ReactNode }) {
  if (pools.length === 0) return <p className="text-muted">{empty}</p>;
  return (
    <ul className="space-y-2">
      {pools.map(({ poolId, street, detail }) => (
        <li key={poolId}>
          <Link to={`/visit/${poolId}`} className="block rounded-xl border border-line bg-white px-4 py-3 hover:bg-verdigris-50">
            <span className="block font-medium">{street}</span>
            <span className="block text-sm text-muted">{detail}</span>
            <MetalBadge mark={marks[poolId]} />
          </Link>
        </li>
      ))}
    </ul>
  );
}

export default function VisitPicker({ loaderData }: Route.ComponentProps) {
  const { weekday, stops, q, found, marks, timeZone, memberId } = loaderData;
  useKeptVisitSender(memberId);
  // Today's pools (and any found by a search) are kept for use without signal, with this list.
  const poolIds = [...new Set([...stops, ...found].map((p) => p.poolId))];
  const keep = useKeptPages(visitPagesFor(poolIds, true));
  return (
    <div className="mx-auto max-w-xl space-y-6">
      <PageHeader title="Log a visit">Pick the pool you are at.</PageHeader>
      <NoSignalNotice />
      <KeptVisitsPanel memberId={memberId} timeZone={timeZone} />
      <Form method="get" role="search" className="flex gap-2">
        <label className="grow">
          <span className="sr-only">Search pools</span>
          <input
            type="search"
            name="q"
            defaultValue={q}
            placeholder="Street, customer or account"
            className="block w-full rounded-lg border border-line bg-white px-3 py-3 text-base"
          />
        </label>
        <button type="submit" className="rounded-lg border border-line bg-white px-4 font-medium">
          Search
        </button>
      </Form>
      {q ? (
        <section aria-labelledby="found">
          <h2 id="found" className="mb-2 font-semibold">Matching “{q}”</h2>
          <PoolChoices
            pools={found.map((p) => ({ ...p, detail: `${p.customerName} · ${p.accountCode} · ${p.routeName ?? "no route"}` }))}
            marks={marks}
            empty="No pool on your routes matches."
          />
        </section>
      ) : null}
      <section aria-labelledby="today">
        <h2 id="today" className="mb-2 font-semibold">
          {weekdayName(weekday)}'s route: {stops.length} {stops.length === 1 ? "pool" : "pools"}
        </h2>
        <PoolChoices
          pools={stops.map((s) => ({ ...s, detail: `${s.customerName} · ${s.routeName} · last visit ${formatDate(s.lastVisitAt, timeZone)}` }))}
          marks={marks}
          empty={<>None of your routes is served on {weekdayName(weekday)}. Search for the pool instead.</>}
        />
      </section>
      <KeptPagesNote keep={keep} pools={poolIds.length} />
    </div>
  );
}

export { ErrorPanel as ErrorBoundary } from "~/components/error-panel";
