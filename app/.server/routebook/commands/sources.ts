import { and, eq } from "drizzle-orm";
import type { SourceInput, SourceTestInput } from "~/lib/forms/routebook";
import { db } from "../../db/client";
import { metalColumnValues } from "../../db/values";
import { fillSources, sourceTests } from "../../db/schema";
import type { Scope } from "../../scope";
import { invalid, notFound, type ServiceResult } from "../../command-result";
import { saveCompanyRow } from "./save-company-row";

/** Creates or changes a fill source. Archiving is `active: false`; sources are never deleted. */
export async function saveSource(scope: Scope, sourceId: number | null, input: SourceInput): Promise<ServiceResult> {
  return saveCompanyRow(scope, fillSources, sourceId, input, {
    notFound: "No fill source with that number in your company.",
    clash: { key: "fill_sources_company_name", field: "name", message: `Source name: "${input.name}" is already used by another fill source.` },
  });
}

/**
 * Records a test of the fill water. The same results for the same day are
 * taken as a repeated submit and stored once.
 */
export async function addSourceTest(
  scope: Scope,
  sourceId: number,
  input: SourceTestInput,
  today: string,
): Promise<ServiceResult<{ id: number; repeated: boolean }>> {
  if (input.sampledOn > today) return invalid({ sampledOn: `Sampled on: ${input.sampledOn} is later than today (${today}).` });
  return db().transaction(async (tx) => {
    const [source] = await tx
      .select({ id: fillSources.id })
      .from(fillSources)
      .where(and(eq(fillSources.companyId, scope.companyId), eq(fillSources.id, sourceId)))
      .for("update");
    if (!source) return notFound("No fill source with that number in your company.");
    const values = {
      sampledOn: input.sampledOn,
      ...metalColumnValues(input),
      note: input.note,
    };
    const sameDay = await tx
      .select()
      .from(sourceTests)
      .where(and(eq(sourceTests.fillSourceId, sourceId), eq(sourceTests.sampledOn, input.sampledOn)));
    const repeat = sameDay.find(
      (t) =>
        t.copper === values.copper &&
        t.iron === values.iron &&
        t.manganese === values.manganese &&
        t.copperBelowDetection === values.copperBelowDetection &&
        t.ironBelowDetection === values.ironBelowDetection &&
        t.manganeseBelowDetection === values.manganeseBelowDetection,
    );
    if (repeat) return { ok: true as const, id: repeat.id, repeated: true };
    const [created] = await tx
      .insert(sourceTests)
      .values({ companyId: scope.companyId, fillSourceId: sourceId, ...values })
      .$returningId();
    return { ok: true as const, id: created!.id, repeated: false };
  });
}
