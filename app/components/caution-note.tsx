import type { ReactNode } from "react";

export type CautionTopic = "acid" | "equipment" | "drain" | "dose";

const CAUTIONS: Record<CautionTopic, { title: string; points: string[] }> = {
  acid: {
    title: "Handling acid",
    points: [
      "Acid is corrosive: wear eye and skin protection.",
      "Add acid to water, never water to acid.",
      "Never mix acid with chlorine products, and store them apart.",
    ],
  },
  equipment: {
    title: "Before opening equipment",
    points: ["Switch off and lock out the pump (and the heater) before opening it.", "Let a heater cool before working on it."],
  },
  drain: {
    title: "Before draining",
    points: [
      "Draining can let ground water lift the shell.",
      "Discharge of pool water may be regulated: check local rules and use a qualified contractor.",
    ],
  },
  dose: {
    title: "Dose figures",
    points: ["Doses are estimates from the product label and the recorded pool volume."],
  },
};

/**
 * The usual safety notes beside anything that suggests acid, draining or
 * opening equipment. Always defers to the label, local codes and licensed practice.
 */
export function CautionNote({ topics, children }: { topics: readonly CautionTopic[]; children?: ReactNode }) {
  return (
    <aside role="note" aria-label="Caution" className="rounded-xl border border-watch/60 bg-yellow-50 px-4 py-3 text-sm">
      <p className="font-semibold">Caution</p>
      {children ? <div className="mt-1">{children}</div> : null}
      <ul className="mt-1 list-disc space-y-0.5 pl-5">
        {topics.flatMap((topic) => CAUTIONS[topic].points.map((point) => <li key={`${topic}-${point}`}>{point}</li>))}
      </ul>
      <p className="mt-1 text-muted">Follow the product label, local codes and licensed practice.</p>
    </aside>
  );
}
