import type { OutlookAnswer, OutlookEntryJson } from "~/.server/analytics/queries/metal-outlook";
import { TextLink } from "~/components/text-link";
import { formatDate, formatMgL } from "~/lib/format";
import { METAL_LABELS } from "@analysis/metals/names";

export const OUTLOOK_NAME = "Metal outlook";

/** A chance in words and figures: "12%", or "under 1%". */
export function formatChance(probability: number | null): string {
  if (probability === null) return "—";
  if (probability < 0.01) return "under 1%";
  return `${Math.round(probability * 100)}%`;
}

/** Pools most likely to open a metal episode in the next four weeks, each with its reasons. */
export function OutlookList({
  entries,
  method,
  timeZone,
  caption,
}: {
  entries: readonly OutlookEntryJson[];
  method: OutlookAnswer["method"];
  timeZone: string;
  caption: string;
}) {
  if (entries.length === 0) {
    return <p className="rounded-xl border border-line bg-white p-4 text-muted">No pool on your routes is on the outlook: each is either without a test in the last five weeks or already in an open episode.</p>;
  }
  return (
    <div className="overflow-x-auto rounded-xl border border-line bg-white">
      <table className="w-full text-left text-sm" data-outlook-list>
        <caption className="sr-only">{caption}</caption>
        <thead className="border-b border-line text-muted">
          <tr>
            <th scope="col" className="px-4 py-2 font-medium">Pool</th>
            <th scope="col" className="px-4 py-2 font-medium">Metal</th>
            <th scope="col" className="px-4 py-2 font-medium">{method === "model" ? "Chance in 4 weeks" : "Latest reading"}</th>
            <th scope="col" className="px-4 py-2 font-medium">Why</th>
          </tr>
        </thead>
        <tbody className="divide-y divide-line">
          {entries.map((e) => (
            <tr key={`${e.poolId}-${e.metal}`} data-flagged={e.flagged ? "yes" : "no"}>
              <td className="px-4 py-2 align-top">
                <TextLink to={`/pools/${e.poolId}`}>{e.street}</TextLink>
                <span className="block text-xs text-muted">
                  {e.customerName}
                  {e.fillSourceName ? ` · ${e.fillSourceName}` : ""}
                </span>
              </td>
              <td className="px-4 py-2 align-top">{METAL_LABELS[e.metal]}</td>
              <td className="px-4 py-2 align-top tabular-nums">
                {method === "model" ? (
                  <>
                    {e.flagged ? (
                      <span aria-hidden="true" className="mr-1 text-alert">
                        ◆
                      </span>
                    ) : null}
                    {formatChance(e.probability)}
                    {e.flagged ? <span className="sr-only"> (flagged: top tenth of the company)</span> : null}
                  </>
                ) : (
                  <>
                    {e.latestValue === null ? "none yet" : formatMgL(e.latestValue)}
                    {e.latestAt ? <span className="block text-xs text-muted">{formatDate(e.latestAt, timeZone)}</span> : null}
                  </>
                )}
              </td>
              <td className="px-4 py-2 align-top">
                {e.reasons.length === 0 ? (
                  <span className="text-muted">Near the company's average</span>
                ) : (
                  <ul className="list-disc space-y-0.5 pl-4">
                    {e.reasons.map((r) => (
                      <li key={r.key}>{r.text}</li>
                    ))}
                  </ul>
                )}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
