import type { PoolLabelAmount } from "@analysis/units/label-dose";
import { formatVolume, type UnitSystem } from "~/lib/units";

const amountFormat = new Intl.NumberFormat("en", { maximumSignificantDigits: 3 });

function amountText(amount: number, unit: string, equivalent: { amount: number; unit: string } | null): string {
  const own = `${amountFormat.format(amount)} ${unit}`;
  return equivalent ? `${own} (${amountFormat.format(equivalent.amount)} ${equivalent.unit})` : own;
}

/**
 * The product label's amount for this pool, beside a treatment line. It is
 * shown to check against, never typed into the amount for the technician.
 */
export function LabelAmount({ answer, volumeLitres, units }: { answer: PoolLabelAmount | null; volumeLitres: number | null; units: UnitSystem }) {
  if (!answer || answer.kind === "no-label") return null;
  if (answer.kind === "volume-unknown") {
    return (
      <p className="col-span-2 text-sm text-muted">
        Label amount: this pool's volume is not recorded, so it cannot be worked out. Add the volume on the pool's page.
      </p>
    );
  }
  const parts = [
    answer.start === null ? null : `start ${amountText(answer.start, answer.unit, answer.startEquivalent)}`,
    answer.maintenance === null ? null : `maintenance ${amountText(answer.maintenance, answer.unit, answer.maintenanceEquivalent)}`,
  ].filter(Boolean);
  return (
    <p className="col-span-2 text-sm" data-label-amount>
      <span className="font-medium">Label amount for this pool ({formatVolume(volumeLitres, units)}):</span> {parts.join(" · ")}
    </p>
  );
}
