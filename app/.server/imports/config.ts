import { resolve } from "node:path";

/** Where uploaded files are kept, and how large one may be. Both can be set in the environment. */
export function importConfig() {
  const maxMegabytes = Number(process.env.PATINA_UPLOAD_MAX_MB ?? 50);
  return {
    uploadDir: resolve(process.env.PATINA_UPLOAD_DIR ?? ".data/uploads"),
    maxBytes: Math.round((Number.isFinite(maxMegabytes) && maxMegabytes > 0 ? maxMegabytes : 50) * 1024 * 1024),
  };
}
