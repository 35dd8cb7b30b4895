import { useMemo, useState } from "react";
import { METAL_LABELS } from "@analysis/metals/names";
import type { RecurringPool } from "@analysis/metals/recurring-finder";
import { TextLink } from "~/components/text-link";

type Row = {
  poolId: number;
  street: string;
  metals: string;
  openings: number;
  lastOpenedAt: string;
  chronic: boolean;
  source: string;
  route: string;
};

type SortKey = "street" | "metals" | "openings" | "lastOpenedAt" | "chronic" | "source" | "route";

const COLUMNS: Array<{ key: SortKey; label: string; numeric?: boolean }> = [
  { key: "street", label: "Pool" },
  { key: "metals", label: "Metal" },
  { key: "openings", label: "Openings", numeric: true },
  { key: "lastOpenedAt", label: "Last episode" },
  { key: "chronic", label: "Chronic" },
  { key: "source", label: "Fill source" },
  { key: "route", label: "Route" },
];

function rowOf(pool: RecurringPool): Row {
  const openedAt = pool.episodes.map((e) => e.openedAt).sort();
  return {
    poolId: pool.poolId,
    street: pool.street,
    metals: pool.metals.map((m) => METAL_LABELS[m.metal]).join(", "),
    openings: pool.metals.reduce((sum, m) => sum + m.openings, 0),
    lastOpenedAt: openedAt.at(-1)?.slice(0, 10) ?? "",
    chronic: pool.metals.some((m) => m.chronic),
    source: pool.fillSourceName ?? "not recorded",
    route: pool.routeName ?? "no route",
  };
}

function compare(a: Row, b: Row, key: SortKey): number {
  const x = a[key];
  const y = b[key];
  if (typeof x === "number" && typeof y === "number") return x - y;
  if (typeof x === "boolean" && typeof y === "boolean") return Number(x) - Number(y);
  return String(x).localeCompare(String(y));
}

/** The listed pools as one table, sorted by any column (most openings first to start). */
export function RecurringTable({ pools }: { pools: readonly RecurringPool[] }) {
  const [sort, setSort] = useState<{ key: SortKey; descending: boolean }>({ key: "openings", descending: true });
  const rows = useMemo(() => {
    const all = pools.map(rowOf);
    all.sort((a, b) => (sort.descending ? -1 : 1) * compare(a, b, sort.key) || a.poolId - b.poolId);
    return all;
  }, [pools, sort]);
  const sortBy = (key: SortKey) =>
    setSort((current) => (current.key === key ? { key, descending: !current.descending } : { key, descending: key === "openings" || key === "lastOpenedAt" || key === "chronic" }));
  return (
    <div className="overflow-x-auto rounded-xl border border-line bg-white">
      <table className="w-full text-left text-sm">
        <caption className="sr-only">Recurring and chronic pools, sortable by each column</caption>
        <thead className="border-b border-line text-muted">
          <tr>
            {COLUMNS.map((c) => (
              <th
                key={c.key}
                scope="col"
                aria-sort={sort.key === c.key ? (sort.descending ? "descending" : "ascending") : "none"}
                className={`px-3 py-2 font-medium ${c.numeric ? "text-right" : ""}`}
              >
                <button type="button" onClick={() => sortBy(c.key)} className="underline-offset-2 hover:underline">
                  {c.label}
                  {sort.key === c.key ? <span aria-hidden="true">{sort.descending ? " ↓" : " ↑"}</span> : null}
                </button>
              </th>
            ))}
          </tr>
        </thead>
        <tbody className="divide-y divide-line">
          {rows.map((r) => (
            <tr key={r.poolId}>
              <td className="px-3 py-2">
                <TextLink to={`/pools/${r.poolId}`}>{r.street}</TextLink>
              </td>
              <td className="px-3 py-2">{r.metals}</td>
              <td className="px-3 py-2 text-right tabular-nums">{r.openings}</td>
              <td className="px-3 py-2 tabular-nums">{r.lastOpenedAt}</td>
              <td className="px-3 py-2">{r.chronic ? "chronic" : "—"}</td>
              <td className="px-3 py-2">{r.source}</td>
              <td className="px-3 py-2">{r.route}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
