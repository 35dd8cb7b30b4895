import { apiError, requireArea } from "~/.server/guard";
import { refusedRowsCsv } from "~/.server/imports/check";
import { findUpload } from "~/.server/imports/uploads";
import { readImportOptions } from "~/lib/imports/options";
import { uploadIdParams } from "~/lib/imports/params";
import type { Route } from "./+types/api.imports.$uploadId.refused[.csv]";

/** The refused rows of an upload under its saved choices, as a CSV to fix and upload again. */
export async function loader({ params, context }: Route.LoaderArgs) {
  const scope = requireArea(context, "imports");
  const parsed = uploadIdParams.safeParse(params);
  if (!parsed.success) throw apiError(404, "not_found", "No upload with that id in your company.", "uploadId");
  const upload = await findUpload(scope, parsed.data.uploadId);
  const options = upload ? readImportOptions(upload.options) : null;
  if (!upload || !options) throw apiError(404, "not_found", "No upload with that id in your company.", "uploadId");
  const csv = await refusedRowsCsv(scope, upload.id, options);
  const base = upload.fileName.replace(/\.[^.]+$/, "").replace(/[^\w.-]+/g, "-") || "upload";
  return new Response(csv, {
    headers: {
      "Content-Type": "text/csv; charset=utf-8",
      "Content-Disposition": `attachment; filename="${base}-refused-rows.csv"`,
    },
  });
}
