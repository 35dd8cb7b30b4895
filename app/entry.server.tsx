import { PassThrough } from "node:stream";
import { createReadableStreamFromReadable } from "@react-router/node";
import { isbot } from "isbot";
import { type RenderToPipeableStreamOptions, renderToPipeableStream } from "react-dom/server";
import { type EntryContext, type HandleErrorFunction, type RouterContextProvider, ServerRouter } from "react-router";
import { headersFor, newNonce } from "~/.server/security/headers";
import { cspNonceContext, readContext } from "~/.server/security/request-context";
import { noteRequestError } from "~/.server/service-unavailable";
import { startServerWorkers } from "~/.server/workers";
import { NonceContext } from "~/lib/nonce";

// The custom server (server.mjs) sets the socket address under this key.
export { socketAddressContext } from "~/.server/security/request-context";

// Long-running work of this server process (the mail sender, releasing
// interrupted imports) starts with the server, not with the first request.
startServerWorkers();

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
  loadContext: RouterContextProvider,
) {
  // The root middleware set the nonce and headers; a URL no route matches never reaches it.
  let nonce = readContext(loadContext, cspNonceContext);
  if (nonce === undefined) {
    nonce = newNonce();
    for (const [name, value] of Object.entries(headersFor(nonce)))
      responseHeaders.set(name, value);
  }
  if (request.method.toUpperCase() === "HEAD") {
    return new Response(null, {
      status: responseStatusCode,
      headers: responseHeaders,
    });
  }

  return new Promise<Response>((resolve, reject) => {
    let shellRendered = false;
    const userAgent = request.headers.get("user-agent");
    // Crawlers get the whole document at once; people get the shell as soon as it is ready.
    const readyOption: keyof RenderToPipeableStreamOptions =
      (userAgent && isbot(userAgent)) || routerContext.isSpaMode
        ? "onAllReady"
        : "onShellReady";

    let timeoutId: ReturnType<typeof setTimeout> | undefined = setTimeout(
      () => abort(),
      streamTimeout + 1000,
    );

    const { pipe, abort } = renderToPipeableStream(
      <NonceContext.Provider value={nonce}>
        <ServerRouter context={routerContext} url={request.url} nonce={nonce} />
      </NonceContext.Provider>,
      {
        nonce,
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
          resolve(
            new Response(createReadableStreamFromReadable(body), {
              headers: responseHeaders,
              status: responseStatusCode,
            }),
          );
        },
        onShellError(error: unknown) {
          reject(error);
        },
        onError(error: unknown) {
          responseStatusCode = 500;
          if (shellRendered) console.error(error);
        },
      },
    );
  });
}
