import { apiError, requireArea } from "~/.server/guard";
import { findUpload } from "~/.server/imports/uploads";
import { uploadIdParams } from "~/lib/imports/params";
import type { Route } from "./+types/api.imports.$uploadId";

/** Where an upload stands: phase and rows done, polled while a file is checked or committed. */
export async function loader({ params, context }: Route.LoaderArgs) {
  const scope = requireArea(context, "imports");
  const parsed = uploadIdParams.safeParse(params);
  if (!parsed.success) throw apiError(404, "not_found", "No upload with that id in your company.", "uploadId");
  const upload = await findUpload(scope, parsed.data.uploadId);
  if (!upload) throw apiError(404, "not_found", "No upload with that id in your company.", "uploadId");
  return Response.json({
    id: upload.id,
    fileName: upload.fileName,
    phase: upload.phase,
    rowsDone: upload.rowsDone,
    rowsTotal: upload.rowsTotal,
    error: upload.error,
    importBatchId: upload.importBatchId,
  });
}
