import type { MetalMark } from "~/.server/visits/queries/metal-marks";
import { METAL_LABELS } from "@analysis/metals/names";

/** Plain words on the card, so the mark does not rest on colour alone. */
export function metalMarkText(mark: MetalMark): string {
  const parts: string[] = [];
  if (mark.openMetals.length > 0) {
    const metals = mark.openMetals.map((m) => METAL_LABELS[m].toLowerCase()).join(", ");
    parts.push(`open ${metals} episode`);
  }
  if (mark.suspected) parts.push("metal suspected");
  const text = `${parts.join(" · ")}: bring the metal test`;
  return text[0]!.toUpperCase() + text.slice(1);
}

/** Why to bring the metal test kit to a pool on today's list; nothing when there is no reason. */
export function MetalBadge({ mark }: { mark: MetalMark | undefined }) {
  if (!mark) return null;
  return (
    <span className="mt-1 inline-block rounded-md border border-watch bg-yellow-50 px-2 py-0.5 text-sm font-medium">
      <span aria-hidden="true">◆ </span>
      {metalMarkText(mark)}
    </span>
  );
}
