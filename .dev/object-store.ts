// Runs the local S3-compatible object store (s3rver) in the foreground:
//   node --import tsx .dev/object-store.ts --port 9000 --dir .data/s3 --bucket patina-uploads
// `.dev/object-store.sh` starts and stops it by pid; the app reaches it through PATINA_S3_URL.
import { mkdirSync } from "node:fs";
import { parseArgs } from "node:util";
import S3rver from "s3rver";

const { values } = parseArgs({
  options: {
    port: { type: "string", default: "9000" },
    dir: { type: "string", default: ".data/s3" },
    bucket: { type: "string", default: "patina-uploads" },
  },
});

const port = Number(values.port);
if (!Number.isInteger(port) || port <= 0 || port > 65_535) {
  console.error(`--port: "${values.port}" is not a TCP port number`);
  process.exit(2);
}

mkdirSync(values.dir, { recursive: true });
// Loopback only; the keys are s3rver's own (S3RVER / S3RVER), which are Patina's local defaults.
const store = new S3rver({ address: "127.0.0.1", port, directory: values.dir, silent: true, configureBuckets: [{ name: values.bucket, configs: [] }] });
await store.run();
console.log(`[patina] object store on http://127.0.0.1:${port}, bucket ${values.bucket}, files in ${values.dir}`);
for (const signal of ["SIGTERM", "SIGINT"] as const) {
  process.once(signal, () => void store.close().finally(() => process.exit(0)));
}
