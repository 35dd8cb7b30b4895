import { PassThrough } from "node:stream";
import { createReadableStreamFromReadable } from "@react-router/node";
import { isbot } from "isbot";
import type { RenderToPipeableStreamOptions } from "react-dom/server";
import { renderToPipeableStream } from "react-dom/server";
import type { EntryContext, HandleErrorFunction, RouterContextProvider } from "react-router";
import { ServerRouter } from "react-router";
import { noteRequestError } from "./.server/service-unavailable";
import { releaseDeadClaims } from "./.server/imports/claims";

// On start, commits left by a process of this host that is gone (or by any
// process, past the claim timeout) are marked stopped, so they can be committed again.
const started = globalThis as typeof globalThis & { __patinaClaimsReleased?: boolean };
if (!started.__patinaClaimsReleased) {
  started.__patinaClaimsReleased = true;
  releaseDeadClaims()
    .then((released) => {
      if (released > 0) console.log(`[patina] ${released} interrupted import(s) marked stopped; nothing of them was stored`);
    })
    .catch((error: unknown) => console.error("[patina] could not release interrupted imports:", error));
}

export const streamTimeout = 5_000;

/**
 * Every error a loader, action or render threw. The request remembers a lost
 * database or a stopped statement, so the answer becomes a 503 (see
 * `faultMiddleware`); work stopped because its client went away is not logged.
 */
export const handleError: HandleErrorFunction = (error, { request }) => {
  noteRequestError(error);
  if (request.signal.aborted) return;
  console.error(error);
};

export default function handleRequest(
  request: Request,
  responseStatusCode: number,
  responseHeaders: Headers,
  routerContext: EntryContext,
  _loadContext: RouterContextProvider,
) {
  if (request.method.toUpperCase() === "HEAD") {
    return new Response(null, { status: responseStatusCode, headers: responseHeaders });
  }

  return new Promise<Response>((resolve, reject) => {
    let shellRendered = false;
    const userAgent = request.headers.get("user-agent");
    // Crawlers get the whole document at once; people get the shell as soon as it is ready.
    const readyOption: keyof RenderToPipeableStreamOptions =
      (userAgent && isbot(userAgent)) || routerContext.isSpaMode ? "onAllReady" : "onShellReady";

    let timeoutId: ReturnType<typeof setTimeout> | undefined = setTimeout(() => abort(), streamTimeout + 1000);

    const { pipe, abort } = renderToPipeableStream(<ServerRouter context={routerContext} url={request.url} />, {
      [readyOption]() {
        shellRendered = true;
        const body = new PassThrough({
          final(callback) {
            clearTimeout(timeoutId);
            timeoutId = undefined;
            callback();
          },
        });
        responseHeaders.set("Content-Type", "text/html");
        pipe(body);
        resolve(new Response(createReadableStreamFromReadable(body), { headers: responseHeaders, status: responseStatusCode }));
      },
      onShellError(error: unknown) {
        reject(error);
      },
      onError(error: unknown) {
        responseStatusCode = 500;
        if (shellRendered) console.error(error);
      },
    });
  });
}
