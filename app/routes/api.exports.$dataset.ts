import { z } from "zod";
import { apiError, requireArea } from "~/.server/guard";
import { DATASETS, exportStream } from "~/.server/exports/datasets";
import type { Route } from "./+types/api.exports.$dataset";

const datasetParams = z.object({
  dataset: z
    .string()
    .regex(/\.csv$/, { error: "ask for a .csv file, e.g. water-tests.csv" })
    .transform((name) => name.slice(0, -4))
    .pipe(z.enum(Object.keys(DATASETS) as [keyof typeof DATASETS, ...Array<keyof typeof DATASETS>], {
      error: `the data sets are ${Object.keys(DATASETS).map((d) => `${d}.csv`).join(", ")}`,
    })),
});

/** One data set of the member's company as CSV, streamed. */
export async function loader({ params, context }: Route.LoaderArgs) {
  const scope = requireArea(context, "exports");
  const parsed = datasetParams.safeParse(params);
  if (!parsed.success) {
    throw apiError(404, "not_found", `No data set "${params.dataset}": ${parsed.error.issues[0]?.message}.`, "dataset");
  }
  const day = new Date().toISOString().slice(0, 10);
  return new Response(exportStream(scope, parsed.data.dataset), {
    headers: {
      "Content-Type": "text/csv; charset=utf-8",
      "Content-Disposition": `attachment; filename="patina-${parsed.data.dataset}-${day}.csv"`,
      "Cache-Control": "no-store",
    },
  });
}
