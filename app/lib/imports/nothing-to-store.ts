import { formatCount } from "../format";

type Counts = { testsToAdd: number; treatmentsToAdd: number; duplicates: number; refusedRows: number; leftOutUnknownPool: number };

export function hasNothingToStore(counts: Pick<Counts, "testsToAdd" | "treatmentsToAdd">): boolean {
  return counts.testsToAdd + counts.treatmentsToAdd === 0;
}

/** Why a checked file would store nothing, in the words the page and the refused commit both use. */
export function nothingToStoreMessage(counts: Counts): string {
  const reasons = [
    counts.duplicates > 0 ? `${formatCount(counts.duplicates)} already stored` : null,
    counts.refusedRows > 0 ? `${formatCount(counts.refusedRows)} refused` : null,
    counts.leftOutUnknownPool > 0 ? `${formatCount(counts.leftOutUnknownPool)} for pools Patina does not know` : null,
  ].filter(Boolean);
  const why = reasons.length > 0 ? ` Of its rows: ${reasons.join(", ")}.` : " The file has no rows to read.";
  return `Nothing to import: no row would add a water test or a treatment.${why} Change the columns or the choices above and check again, or set the file aside.`;
}
