import type { MiddlewareFunction } from "react-router";
import { refuse } from "./refusal";

const BODYLESS_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);
const FORM_TYPES = ["application/x-www-form-urlencoded", "multipart/form-data"];
/** Page forms are small; files go to the upload API, which streams them. */
export const PAGE_FORM_MAX_BYTES = 1024 * 1024;

function mediaType(request: Request): string | null {
  const header = request.headers.get("Content-Type");
  return header === null ? null : header.split(";")[0]!.trim().toLowerCase();
}

/**
 * What a page action may receive: a form, urlencoded or multipart, that
 * parses. Checked before any action reads it, so a malformed body is a 400
 * or 415 that names the problem rather than an error inside the action.
 * The JSON API checks its own bodies (the upload endpoint streams its file).
 */
export async function pageBodyProblem(
  request: Request,
): Promise<{ status: 400 | 413 | 415; code: string; message: string } | null> {
  if (BODYLESS_METHODS.has(request.method.toUpperCase())) return null;
  const type = mediaType(request);
  if (type === null) return null;
  if (!FORM_TYPES.includes(type)) {
    return {
      status: 415,
      code: "unsupported_media_type",
      message: `Forms are sent as ${FORM_TYPES.join(" or ")}; this request was ${type}.`,
    };
  }
  const declared = Number(request.headers.get("Content-Length") ?? NaN);
  if (Number.isFinite(declared) && declared > PAGE_FORM_MAX_BYTES) {
    return {
      status: 413,
      code: "payload_too_large",
      message:
        "The form is larger than 1 MB; files are uploaded on the import page.",
    };
  }
  if (type === "multipart/form-data") {
    try {
      await request.clone().formData();
    } catch {
      return {
        status: 400,
        code: "malformed_body",
        message: "The form could not be read: its multipart body is malformed.",
      };
    }
  }
  return null;
}

export const bodyCheck: MiddlewareFunction<Response> = async (
  { request },
  next,
) => {
  const path = new URL(request.url).pathname;
  const isApi = path === "/api" || path.startsWith("/api/");
  if (!isApi) {
    const problem = await pageBodyProblem(request);
    if (problem)
      return refuse(request, problem.status, problem.code, problem.message);
  }
  return next();
};
