import { readFileSync } from "node:fs";
import { createReadableStreamFromReadable } from "@react-router/node";
import { isbot } from "isbot";
import type { RenderToPipeableStreamOptions } from "react-dom/server";
import { renderToPipeableStream } from "react-dom/server";
import { RouterContextProvider, ServerRouter, type EntryContext } from "react-router";
import { InlineStylesProvider } from "~/components/inline-styles";
import { NonceProvider } from "~/components/nonce";
import { bodyLimitFor, bodyTooLarge } from "~/lib/platform/body-limits.server";
import { env } from "~/lib/platform/env.server";
import { socketAddressContext } from "~/lib/platform/rate-limit.server";
import { applyBaselineHeaders, nonceContext } from "~/lib/platform/security.server";
import "~/lib/platform/db.server";
import "~/lib/jobs/background.server";
import { accessLogPath } from "~/lib/platform/access-log";
import { scriptsAfterFirstPaint } from "~/lib/platform/scripts-after-paint.server";
import { HEALTH_PATH, healthWithHeaders } from "~/lib/platform/health.server";

import stylesheetHref from "./app.css?url";
import fontsHref from "./fonts.css?url";

export const streamTimeout = 5_000;

/**
 * The built stylesheet's text, read once at start from the client build beside this server build
 * (build/client/assets/…), to be set inline in every page's head. Null under the dev server or when
 * the file cannot be read: then pages link it as before.
 */
const inlineStyles: string | null = (() => {
  if (import.meta.env.DEV || !stylesheetHref.startsWith("/assets/")) return null;
  try {
    // A "</style" inside the text would end the element early; a built stylesheet has none, but never risk it.
    const text = readFileSync(new URL(`../client${stylesheetHref}`, import.meta.url), "utf8");
    return /<\/style/i.test(text) ? null : text;
  } catch {
    return null;
  }
})();

// The framework answers a malformed Origin header with a bare 400 (the server adds the security
// headers); that is the client's fault and not worth a stack trace in the log per request.
export function handleError(error: unknown, { request }: { request: Request }) {
  if (request.signal.aborted) return;
  if (error instanceof Error && error.message.startsWith("`origin` header is not a valid URL")) return;
  console.error(error);
}

/**
 * What server.mjs needs from the app, read from the build (`build.entry.module.serverHooks`), so the
 * server and the app share one parsed configuration and one body-limit table.
 */
export const serverHooks = {
  appOrigin: env.appOrigin,
  bodyLimitFor,
  bodyTooLarge,
  applyBaselineHeaders,
  accessLogPath,
  /** GET and HEAD of this path the server answers with `health` itself, without the router. */
  healthPath: HEALTH_PATH,
  health: healthWithHeaders,
  /** The request context for one request: the socket's peer address, for per-address limits. */
  createLoadContext(socketAddress: string | undefined): RouterContextProvider {
    const context = new RouterContextProvider();
    context.set(socketAddressContext, socketAddress ?? null);
    return context;
  },
};

export default function handleRequest(
  request: Request,
  responseStatusCode: number,
  responseHeaders: Headers,
  routerContext: EntryContext,
  loadContext: RouterContextProvider,
) {
  if (request.method.toUpperCase() === "HEAD") {
    return new Response(null, { status: responseStatusCode, headers: responseHeaders });
  }
  const nonce = loadContext.get(nonceContext);

  return new Promise((resolve, reject) => {
    let shellRendered = false;
    const userAgent = request.headers.get("user-agent");
    const readyOption: keyof RenderToPipeableStreamOptions =
      (userAgent && isbot(userAgent)) || routerContext.isSpaMode ? "onAllReady" : "onShellReady";
    let timeoutId: ReturnType<typeof setTimeout> | undefined = setTimeout(() => abort(), streamTimeout + 1000);

    const { pipe, abort } = renderToPipeableStream(
      <NonceProvider value={nonce}>
        <InlineStylesProvider value={inlineStyles}>
          <ServerRouter context={routerContext} url={request.url} nonce={nonce} />
        </InlineStylesProvider>
      </NonceProvider>,
      {
        nonce,
        [readyOption]() {
          shellRendered = true;
          // Nunito comes after the first paint too (app/fonts.css; root.tsx has the no-JavaScript link).
          const body = scriptsAfterFirstPaint(
            () => {
              clearTimeout(timeoutId);
              timeoutId = undefined;
            },
            { stylesheets: [fontsHref] },
          );
          responseHeaders.set("Content-Type", "text/html; charset=utf-8");
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
