import {
  FormDataParseError,
  MaxFilesExceededError,
  MaxFileSizeExceededError,
  MaxTotalSizeExceededError,
  parseFormData,
} from "@remix-run/form-data-parser";
import type { Scope } from "../scope";
import { importConfig } from "./config";
import { registerUpload, removeStoredFile, type StoredFile, UploadRefused, UploadTooLarge, writeUploadFile } from "./uploads";

/** Room for the multipart envelope (boundaries, part headers) around the file. */
export const FORM_MARGIN_BYTES = 64 * 1024;

export type ReceivedUpload =
  | { ok: true; uploadId: string }
  | { ok: false; status: 413 }
  | { ok: false; status: 400; message: string };

/**
 * Reads the multipart body as it arrives and writes its "file" part to the
 * object store. The parser stops as soon as the file passes the size cap.
 */
export async function receiveUpload(scope: Scope, request: Request): Promise<ReceivedUpload> {
  const { maxBytes } = importConfig();
  let stored: StoredFile | null = null;
  let fileName = "";
  try {
    await parseFormData(
      request,
      { maxFiles: 1, maxFileSize: maxBytes, maxTotalSize: maxBytes + FORM_MARGIN_BYTES, maxParts: 20 },
      async (file) => {
        if (file.fieldName !== "file") return null;
        fileName = file.name;
        stored = await writeUploadFile(scope, pieces(file.stream()));
        return null;
      },
    );
  } catch (error) {
    if (stored) await removeStoredFile(stored);
    if (error instanceof UploadTooLarge || error instanceof MaxFileSizeExceededError || error instanceof MaxTotalSizeExceededError) {
      return { ok: false, status: 413 };
    }
    if (error instanceof MaxFilesExceededError) {
      return { ok: false, status: 400, message: "Send one CSV file at a time; the form arrived with more than one." };
    }
    if (error instanceof FormDataParseError) {
      return { ok: false, status: 400, message: "The upload is not a multipart form with a file in it." };
    }
    throw error;
  }
  const file = stored as StoredFile | null;
  if (!file || file.byteSize === 0) {
    if (file) await removeStoredFile(file);
    return { ok: false, status: 400, message: "Choose a CSV file to upload; the form arrived without one or with an empty file." };
  }
  try {
    return { ok: true, uploadId: await registerUpload(scope, fileName, file) };
  } catch (error) {
    if (error instanceof UploadRefused) return { ok: false, status: 400, message: error.message };
    throw error;
  }
}

async function* pieces(stream: ReadableStream<Uint8Array>): AsyncGenerator<Uint8Array> {
  const reader = stream.getReader();
  try {
    for (;;) {
      const { done, value } = await reader.read();
      if (done) return;
      yield value;
    }
  } finally {
    reader.releaseLock();
  }
}
