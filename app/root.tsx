import "@fontsource/inter-tight/400.css";
import "@fontsource/inter-tight/500.css";
import "@fontsource/inter-tight/600.css";
import "@fontsource/inter-tight/700.css";
import "./app.css";

import { QueryClient, QueryClientProvider } from "@tanstack/react-query";
import { useState } from "react";
import { z } from "zod";
import { Links, Meta, Outlet, Scripts, ScrollRestoration } from "react-router";
import type { Route } from "./+types/root";
import { bodyCheck } from "./.server/security/body-check";
import { securityHeadersMiddleware } from "./.server/security/headers";
import { originCheck } from "./.server/security/origin-check";
import { faultMiddleware } from "./.server/service-unavailable";
import { useNonce } from "./lib/nonce";

// zod compiles fast parsers with `new Function` when it may; the Content-Security-Policy
// forbids eval, so it is told not to try (its probe alone is reported as a violation).
z.config({ jitless: true });

// Runs for every request, resource routes included: security headers outermost (so
// refusals and 503s carry them), then the request's fault tracking (database loss
// and overload become 503s), then the cross-site and body checks.
export const middleware: Route.MiddlewareFunction[] = [securityHeadersMiddleware, ...faultMiddleware, originCheck, bodyCheck];

export const meta: Route.MetaFunction = () => [{ title: "Patina" }];

export function Layout({ children }: { children: React.ReactNode }) {
  const nonce = useNonce();
  return (
    <html lang="en">
      <head>
        <meta charSet="utf-8" />
        <meta name="viewport" content="width=device-width, initial-scale=1" />
        <meta name="theme-color" content="#22604f" />
        <link rel="icon" href="/favicon.svg" type="image/svg+xml" />
        <link rel="manifest" href="/manifest.webmanifest" />
        <link rel="apple-touch-icon" href="/icons/patina-192.png" />
        <Meta />
        <Links />
      </head>
      <body className="min-h-dvh">
        {children}
        <ScrollRestoration nonce={nonce} />
        <Scripts nonce={nonce} />
      </body>
    </html>
  );
}

export default function App() {
  const [queryClient] = useState(
    () =>
      new QueryClient({
        defaultOptions: {
          queries: { staleTime: 30_000, refetchOnWindowFocus: false },
        },
      }),
  );
  return (
    <QueryClientProvider client={queryClient}>
      <Outlet />
    </QueryClientProvider>
  );
}

export { ErrorPage as ErrorBoundary } from "./components/error-panel";
