import { sql } from "drizzle-orm";
import type { BalanceInputs } from "@analysis/chemistry/saturation";
import { idList } from "../../db/id-list";
import type { Writer } from "./writer";

/** A pool's latest complete balance test, as its "any" span keeps it: the saturation index's inputs. */
export type SpanBalance = Required<Pick<BalanceInputs, "ph" | "temperatureC" | "calciumHardness" | "totalAlkalinity" | "cyanuricAcid" | "salt" | "tds">>;

/** The span columns, in the order balanceValues lists them. */
export const SPAN_BALANCE_COLUMNS = [
  "balance_ph",
  "balance_temperature_c",
  "balance_calcium_hardness",
  "balance_total_alkalinity",
  "balance_cyanuric_acid",
  "balance_salt",
  "balance_tds",
] as const;

export const balanceValues = (b: SpanBalance | null | undefined) =>
  b ? [b.ph, b.temperatureC, b.calciumHardness, b.totalAlkalinity, b.cyanuricAcid, b.salt, b.tds] : [null, null, null, null, null, null, null];

const orNull = (value: unknown) => (value === null || value === undefined ? null : Number(value));

/**
 * The balance inputs of some tests, by test id: a few hundred primary-key
 * lookups for the pools a write keeps. A locking read, like the read of the
 * pools' tests that named them, so a test committed after the transaction's
 * snapshot is still found.
 */
export async function balanceInputsOfTests(writer: Writer, testIds: readonly string[]): Promise<Map<string, SpanBalance>> {
  const inputs = new Map<string, SpanBalance>();
  for (let from = 0; from < testIds.length; from += 1000) {
    const ids = testIds.slice(from, from + 1000).map(Number);
    const [rows] = (await writer.execute(
      sql`SELECT id, ph, temperature_c, calcium_hardness, total_alkalinity, cyanuric_acid, salt, tds FROM water_tests
        WHERE id IN (${idList(ids)}) LOCK IN SHARE MODE`,
    )) as unknown as [Array<Record<string, unknown>>];
    for (const r of rows) {
      inputs.set(String(r.id), {
        ph: orNull(r.ph),
        temperatureC: orNull(r.temperature_c),
        calciumHardness: orNull(r.calcium_hardness),
        totalAlkalinity: orNull(r.total_alkalinity),
        cyanuricAcid: orNull(r.cyanuric_acid),
        salt: orNull(r.salt),
        tds: orNull(r.tds),
      });
    }
  }
  return inputs;
}
