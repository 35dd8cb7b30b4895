import type { Config } from "@react-router/dev/config";

export default {
  ssr: true,
  // The framework's own origin check covers page actions only and answers a bare 400 before any
  // middleware runs. Patina's check (app/.server/security/origin-check.ts, root middleware) covers
  // every non-GET request, resource routes and API included, so the framework's is switched off.
  allowedActionOrigins: ["**"],
  // Every page carries the whole route list, so the visit pages can move between each other and
  // send kept visits without signal (lazy discovery would ask the server for each new address).
  routeDiscovery: { mode: "initial" },
  future: {
    v8_middleware: true,
    v8_splitRouteModules: true,
    v8_viteEnvironmentApi: true,
    v8_passThroughRequests: true,
    v8_trailingSlashAwareDataRequests: true,
  },
} satisfies Config;
