// Server rendering (React Router's Node default, plus this app's page headers): every page gets a
// fresh CSP nonce that React Router's inline scripts carry (<ServerRouter nonce>, and <Scripts> and
// <ScrollRestoration> through NonceContext in root.tsx), the Content-Security-Policy and the
// Permissions-Policy. Errors of loaders and actions are logged with the request id.
import { createReadableStreamFromReadable } from "@react-router/node";
import { isbot } from "isbot";
import { randomBytes } from "node:crypto";
import { PassThrough } from "node:stream";
import type { RenderToPipeableStreamOptions } from "react-dom/server";
import { renderToPipeableStream } from "react-dom/server";
import type { AppLoadContext, EntryContext, HandleErrorFunction } from "react-router";
import { isRouteErrorResponse, ServerRouter } from "react-router";
import { log, safeError } from "./lib/log.server";
import { NonceContext } from "./lib/nonce";
import { pageSecurityHeaders } from "./lib/security-headers.server";

export const streamTimeout = 5_000;

export default function handleRequest(
  request: Request,
  responseStatusCode: number,
  responseHeaders: Headers,
  routerContext: EntryContext,
  loadContext: AppLoadContext,
) {
  const nonce = randomBytes(16).toString("base64");
  const pathname = new URL(request.url).pathname;
  for (const [name, value] of Object.entries(pageSecurityHeaders({ nonce, pathname, dev: loadContext.dev === true }))) {
    responseHeaders.set(name, value);
  }
  responseHeaders.set("Content-Type", "text/html; charset=utf-8");

  // https://httpwg.org/specs/rfc9110.html#HEAD
  if (request.method.toUpperCase() === "HEAD") {
    return new Response(null, { status: responseStatusCode, headers: responseHeaders });
  }

  return new Promise<Response>((resolve, reject) => {
    let shellRendered = false;
    const userAgent = request.headers.get("user-agent");
    // Bots wait for all content; people get the shell as soon as it is ready.
    const readyOption: keyof RenderToPipeableStreamOptions =
      (userAgent && isbot(userAgent)) || routerContext.isSpaMode ? "onAllReady" : "onShellReady";
    // Abort the rendering stream after `streamTimeout` so it has time to flush the rejected boundaries.
    let timeoutId: ReturnType<typeof setTimeout> | undefined = setTimeout(() => abort(), streamTimeout + 1000);

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
          pipe(body);
          resolve(new Response(createReadableStreamFromReadable(body), { headers: responseHeaders, status: responseStatusCode }));
        },
        onShellError(error: unknown) {
          reject(error);
        },
        onError(error: unknown) {
          responseStatusCode = 500;
          // Errors before the shell reject and are logged by the server entry.
          if (shellRendered) log().error({ reqId: loadContext.requestId, err: safeError(error) }, "error while streaming a page");
        },
      },
    );
  });
}

/** Errors thrown by loaders and actions (not thrown Responses): one log line with the request id. */
export const handleError: HandleErrorFunction = (error, { request, context }) => {
  if (request.signal.aborted) return; // the client went away; nothing to report
  if (isRouteErrorResponse(error)) return; // an answer such as 404 for an unknown address, not a fault
  log().error({ reqId: (context as AppLoadContext | undefined)?.requestId, err: safeError(error) }, "error in a loader or action");
};
