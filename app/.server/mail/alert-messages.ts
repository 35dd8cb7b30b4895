import type { Metal } from "@analysis/metals/reading";
import { formatDate } from "~/lib/format";
import { METAL_LABELS } from "@analysis/metals/names";
import { absoluteUrl, renderMail, type RenderedMail } from "./templates";

export type PoolLabel = { poolId: number; customerName: string; street: string; routeName: string | null };

type Common = { baseUrl: string; companyName: string; timeZone: string };

const mgL = (value: number) => `${value.toFixed(2)} mg/L`;

function poolLine(pool: PoolLabel): string {
  return `${pool.customerName}, ${pool.street}${pool.routeName ? ` (route ${pool.routeName})` : ""}`;
}

function footer(common: Common) {
  return [
    `Sent by Patina to the managers of ${common.companyName}.`,
    "Alerts go out once per event; the figures are the readings logged on the route.",
  ];
}

export function episodeOpenedMail(
  input: Common & { pool: PoolLabel; metal: Metal; openedAt: number; value: number; elevatedLevel: number; clearLevel: number },
): RenderedMail {
  const metal = METAL_LABELS[input.metal];
  const link = absoluteUrl(input.baseUrl, `/pools/${input.pool.poolId}`);
  return renderMail({
    subject: `${metal} elevated at ${input.pool.street}: ${mgL(input.value)}`,
    preview: `${metal} ${mgL(input.value)} on ${formatDate(new Date(input.openedAt), input.timeZone)}, at or above ${mgL(input.elevatedLevel)}.`,
    blocks: [
      { kind: "paragraph", text: `A new test opened a ${metal.toLowerCase()} episode at ${poolLine(input.pool)}.` },
      {
        kind: "facts",
        rows: [
          ["Reading", mgL(input.value)],
          ["Test of", formatDate(new Date(input.openedAt), input.timeZone)],
          ["Elevated from", mgL(input.elevatedLevel)],
          ["Episode closes below", mgL(input.clearLevel)],
        ],
      },
      {
        kind: "paragraph",
        text: "Usual next steps: retest in three to seven days, check pH and the saturation index, and look for the cause (fill water, an ageing heater, a copper algaecide or ioniser) before dosing a sequestrant or fitting a collector pad.",
      },
      { kind: "button", href: link, label: "Open the pool" },
      { kind: "cautions" },
    ],
    footer: footer(input),
  });
}

export function poolRecurringMail(
  input: Common & { pool: PoolLabel; metal: Metal; openedAt: number; previousOpenedAt: number; openingsLastYear: number; windowDays: number },
): RenderedMail {
  const metal = METAL_LABELS[input.metal];
  const link = absoluteUrl(input.baseUrl, `/pools/${input.pool.poolId}`);
  const gapDays = Math.round((input.openedAt - input.previousOpenedAt) / 86_400_000);
  return renderMail({
    subject: `${metal} keeps coming back at ${input.pool.street}`,
    preview: `Second ${metal.toLowerCase()} episode within ${input.windowDays} days.`,
    blocks: [
      {
        kind: "paragraph",
        text: `${poolLine(input.pool)} now counts as a recurring ${metal.toLowerCase()} pool: a new episode opened ${gapDays} days after the previous one, inside the ${input.windowDays}-day window.`,
      },
      {
        kind: "facts",
        rows: [
          ["Previous episode opened", formatDate(new Date(input.previousOpenedAt), input.timeZone)],
          ["This episode opened", formatDate(new Date(input.openedAt), input.timeZone)],
          ["Days between", String(gapDays)],
          [`Episodes in the last ${input.windowDays} days`, String(input.openingsLastYear)],
        ],
      },
      {
        kind: "paragraph",
        text: "Treating again will not stop it coming back: find the cause (fill water, heater, sanitiser, metal objects), and consider a surface acid treatment by a qualified contractor for set-in stains.",
      },
      { kind: "button", href: link, label: "Open the pool" },
      { kind: "cautions" },
    ],
    footer: footer(input),
  });
}

export function sharedSourceMail(
  input: Common & {
    source: { id: number; name: string; kind: string };
    metal: Metal;
    firstOpeningAt: number;
    lastOpeningAt: number;
    pools: PoolLabel[];
    activePools: number;
    poolsRequired: number;
    windowDays: number;
  },
): RenderedMail {
  const metal = METAL_LABELS[input.metal];
  const link = absoluteUrl(input.baseUrl, `/sources/${input.source.id}`);
  return renderMail({
    subject: `${metal} on ${input.pools.length} pools filled from ${input.source.name}`,
    preview: `${input.pools.length} of ${input.activePools} active pools opened a ${metal.toLowerCase()} episode within ${input.windowDays} days.`,
    blocks: [
      {
        kind: "paragraph",
        text: `${input.pools.length} of the ${input.activePools} active pools filled from ${input.source.name} (${input.source.kind.replaceAll("_", " ")}) opened a ${metal.toLowerCase()} episode within ${input.windowDays} days. The fill water itself may carry ${metal.toLowerCase()}: a test of the source settles it.`,
      },
      {
        kind: "facts",
        rows: [
          ["First episode opened", formatDate(new Date(input.firstOpeningAt), input.timeZone)],
          ["Latest episode opened", formatDate(new Date(input.lastOpeningAt), input.timeZone)],
          ["Pools with an episode", `${input.pools.length} of ${input.activePools} active`],
          ["Pools needed for this alert", String(input.poolsRequired)],
        ],
      },
      {
        kind: "table",
        caption: `Pools on ${input.source.name} with a ${metal.toLowerCase()} episode in this wave`,
        columns: [{ label: "Customer" }, { label: "Street" }, { label: "Route" }],
        rows: input.pools.map((p) => [p.customerName, p.street, p.routeName ?? "no route"]),
        empty: "No pools.",
      },
      { kind: "paragraph", text: "Warn the other pools on this source and test them for metals at their next visit." },
      { kind: "button", href: link, label: "Open the fill source" },
      { kind: "cautions" },
    ],
    footer: footer(input),
  });
}
