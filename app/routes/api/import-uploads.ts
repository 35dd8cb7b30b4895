import { redirect } from "react-router";
import { apiError, requireApiMember } from "~/.server/guard";
import { importConfig } from "~/.server/imports/config";
import { storeUpload, UploadTooLarge } from "~/.server/imports/uploads";
import type { Route } from "./+types/import-uploads";

function tooLarge(maxBytes: number) {
  return apiError(
    413,
    "payload_too_large",
    `The file is larger than the ${Math.round(maxBytes / 1024 / 1024)} MB Patina accepts in one upload. Split it into smaller files (by year, say) and upload them one by one.`,
    "file",
  );
}

/** Receives one CSV file (multipart field "file") and answers with the new upload's id. */
export async function action({ request }: Route.ActionArgs) {
  const scope = await requireApiMember(request, "imports");
  if (request.method !== "POST") throw apiError(405, "invalid_parameter", "Send the file with POST.");
  const { maxBytes } = importConfig();
  // Refuse before reading: the multipart envelope adds a little, so allow a small margin.
  const declared = Number(request.headers.get("Content-Length") ?? NaN);
  if (Number.isFinite(declared) && declared > maxBytes + 64 * 1024) throw tooLarge(maxBytes);

  let form: FormData;
  try {
    form = await request.formData();
  } catch {
    throw apiError(400, "invalid_parameter", "The upload is not a multipart form with a file in it.", "file");
  }
  const file = form.get("file");
  if (!(file instanceof File) || file.size === 0) {
    throw apiError(400, "invalid_parameter", "Choose a CSV file to upload; the form arrived without one or with an empty file.", "file");
  }
  if (file.size > maxBytes) throw tooLarge(maxBytes);
  let uploadId: string;
  try {
    uploadId = await storeUpload(scope, file.name, new Uint8Array(await file.arrayBuffer()));
  } catch (error) {
    if (error instanceof UploadTooLarge) throw tooLarge(maxBytes);
    throw error;
  }
  if ((request.headers.get("Accept") ?? "").includes("application/json")) {
    return Response.json({ uploadId, next: `/imports/${uploadId}` }, { status: 201 });
  }
  // Without JavaScript the form posts here directly: go on to the check page.
  return redirect(`/imports/${uploadId}`, 303);
}
