import { useEffect } from "react";
import { isRouteErrorResponse, Links, Meta, Outlet, Scripts, ScrollRestoration } from "react-router";
import type { Route } from "./+types/root";
import { EARLY_INPUT_RECORDER, replayEarlyInput } from "~/components/early-input";
import { ProblemPage } from "~/components/problem-page";
import { INLINE_STYLES_ID, useInlineStyles } from "~/components/inline-styles";
import { useNonce } from "~/components/nonce";
import { securityMiddleware } from "~/lib/platform/security.server";
import stylesheet from "./app.css?url";
import fontsStylesheet from "./fonts.css?url";

export const middleware: Route.MiddlewareFunction[] = [securityMiddleware];

// Nunito's faces (fonts.css) are added by the page's start script once the first paint is done
// (entry.server.tsx); the first paint is set in the metric-matched fallback (app.css) and the swap
// moves nothing. Without JavaScript the <noscript> link below loads them.
export const links: Route.LinksFunction = () => [{ rel: "icon", href: "/favicon.svg", type: "image/svg+xml" }];

export function Layout({ children }: { children: React.ReactNode }) {
  const nonce = useNonce();
  const inlineStyles = useInlineStyles();
  return (
    <html lang="en">
      <head>
        <meta charSet="utf-8" />
        <meta name="viewport" content="width=device-width, initial-scale=1" />
        <meta name="theme-color" content="#1f1b19" />
        {/* Ahead of <Links /> and its module preloads. Inline (production): the first paint waits for no
            request; linked (the dev server, or the built file unreadable): for this file and nothing else. */}
        {inlineStyles === null ? (
          <link rel="stylesheet" href={stylesheet} precedence="default" />
        ) : (
          <style id={INLINE_STYLES_ID} dangerouslySetInnerHTML={{ __html: inlineStyles }} />
        )}
        <noscript>
          <link rel="stylesheet" href={fontsStylesheet} />
        </noscript>
        <Meta />
        <Links />
      </head>
      <body className="min-h-dvh">
        {/* First in the body: notes what the visitor does before the page's code runs (early-input.tsx). */}
        <script nonce={nonce} dangerouslySetInnerHTML={{ __html: EARLY_INPUT_RECORDER }} />
        {children}
        <ScrollRestoration nonce={nonce} />
        <Scripts nonce={nonce} />
      </body>
    </html>
  );
}

export default function App() {
  // Runs once, after every route below has hydrated and attached its handlers.
  useEffect(() => void replayEarlyInput(), []);
  return <Outlet />;
}

export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  if (isRouteErrorResponse(error)) {
    if (error.status === 404) {
      return (
        <ProblemPage
          status={404}
          title="We could not find that page"
          detail="The link may be old, or the page may belong to another account."
        />
      );
    }
    const detail = typeof error.data === "string" ? error.data : error.statusText;
    if (error.status === 403)
      return <ProblemPage status={403} title="This page is not open to your role" detail={detail} />;
    return <ProblemPage status={error.status} title="That did not work" detail={detail} />;
  }
  if (import.meta.env.DEV && error instanceof Error) {
    return <ProblemPage status={500} title="Something broke" detail={error.message} stack={error.stack} />;
  }
  return (
    <ProblemPage
      status={500}
      title="Something broke on our side"
      detail="Please try again in a moment. If it keeps happening, tell us what you were doing."
    />
  );
}
