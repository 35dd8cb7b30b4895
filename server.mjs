// Patina's production server: react-router-serve's setup (static assets,
// compression, access log), plus the one thing it cannot pass on: the client's
// socket address, which sign-in throttling counts by.
import path from "node:path";
import url from "node:url";
import { createRequestHandler } from "@react-router/express";
import compression from "compression";
import express from "express";
import morgan from "morgan";
import { RouterContextProvider } from "react-router";

const buildPath = path.resolve(process.argv[2] ?? "build/server/index.js");
const build = await import(url.pathToFileURL(buildPath).href);
const clientDirectory = path.resolve(path.dirname(buildPath), "..", "client");
const port = Number(process.env.PORT ?? 3000);
process.env.NODE_ENV = process.env.NODE_ENV ?? "production";

const app = express();
app.disable("x-powered-by");
app.use(compression());
app.use("/assets", express.static(path.join(clientDirectory, "assets"), { immutable: true, maxAge: "1y" }));
app.use(express.static(clientDirectory));
app.use(express.static("public", { maxAge: "1h" }));
app.use(morgan("tiny"));
app.all(
  "*",
  createRequestHandler({
    build,
    mode: process.env.NODE_ENV,
    getLoadContext(request) {
      const context = new RouterContextProvider();
      context.set(build.entry.module.socketAddressContext, request.socket.remoteAddress ?? null);
      return context;
    },
  }),
);

const server = process.env.HOST ? app.listen(port, process.env.HOST, listening) : app.listen(port, listening);
function listening() {
  console.log(`[patina] http://localhost:${port}`);
}
for (const signal of ["SIGTERM", "SIGINT"]) process.once(signal, () => server.close(console.error));
