import { redirect } from "react-router";
import { apiError, requireArea } from "~/.server/guard";
import { importConfig } from "~/.server/imports/config";
import { FORM_MARGIN_BYTES, receiveUpload } from "~/.server/imports/receive-upload";
import type { Route } from "./+types/api.imports.uploads";

function tooLarge(maxBytes: number) {
  return apiError(
    413,
    "payload_too_large",
    `The file is larger than the ${Math.round(maxBytes / 1024 / 1024)} MB Patina accepts in one upload. Split it into smaller files (by year, say) and upload them one by one.`,
    "file",
  );
}

export async function loader() {
  throw apiError(405, "method_not_allowed", "Send the file with POST (multipart form, field \"file\").");
}

/** Receives one CSV file (multipart field "file") and answers with the new upload's id. */
export async function action({ request, context }: Route.ActionArgs) {
  const scope = requireArea(context, "imports");
  if (request.method !== "POST") throw apiError(405, "method_not_allowed", "Send the file with POST.");
  const { maxBytes } = importConfig();
  // Refuse before reading: the multipart envelope adds a little, so allow a small margin.
  const declared = Number(request.headers.get("Content-Length") ?? NaN);
  if (Number.isFinite(declared) && declared > maxBytes + FORM_MARGIN_BYTES) throw tooLarge(maxBytes);

  const received = await receiveUpload(scope, request);
  if (!received.ok) {
    throw received.status === 413 ? tooLarge(maxBytes) : apiError(400, "invalid_parameter", received.message, "file");
  }
  const { uploadId } = received;
  if ((request.headers.get("Accept") ?? "").includes("application/json")) {
    return Response.json({ uploadId, next: `/imports/${uploadId}` }, { status: 201 });
  }
  // Without JavaScript the form posts here directly: go on to the check page.
  return redirect(`/imports/${uploadId}`, 303);
}
