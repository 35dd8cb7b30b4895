// Runs the local mail sink: npx tsx .dev/mail-sink-cli.ts --port 2525 --store .data/mail
import { parseArgs } from "node:util";
import { startMailSink } from "./mail-sink";

const { values } = parseArgs({
  options: {
    port: { type: "string", default: "2525" },
    store: { type: "string", default: ".data/mail" },
    host: { type: "string", default: "127.0.0.1" },
  },
});

const port = Number(values.port);
if (!Number.isInteger(port) || port <= 0 || port > 65_535) {
  console.error(`--port: "${values.port}" is not a TCP port number`);
  process.exit(2);
}

try {
  const sink = await startMailSink({ port, storeDir: values.store, host: values.host });
  console.log(`[patina] mail sink on smtp://${values.host}:${port}, messages in ${values.store}`);
  for (const signal of ["SIGTERM", "SIGINT"] as const) {
    process.once(signal, () => void sink.stop().finally(() => process.exit(0)));
  }
} catch (error) {
  const code = (error as NodeJS.ErrnoException).code;
  if (code === "EADDRINUSE") {
    // A sink from an earlier run is still listening: it serves this run as well.
    console.log(`[patina] port ${port} is taken; assuming a mail sink is already running there`);
    process.exit(0);
  }
  throw error;
}
