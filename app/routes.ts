import { index, layout, prefix, route, type RouteConfig } from "@react-router/dev/routes";

export default [
  route("sign-in", "routes/sign-in.tsx"),
  route("sign-out", "routes/sign-out.tsx"),
  // mail and invitations: public pages (invitation links, password reset, unsubscribe)

  layout("routes/app-layout.tsx", [
    index("routes/home.tsx"),
    route("team", "routes/team.tsx"),
    route("settings", "routes/settings.tsx"),
    // route book and visits
    route("pools/:poolId", "routes/pool.tsx"),
    // analytics
    // imports and exports
    // mail and invitations: signed-in pages
  ]),

  ...prefix("api", [
    route("auth/*", "routes/api/auth.ts"),
    route("summary", "routes/api/summary.ts"),
    route("pools/:poolId", "routes/api/pool.ts"),
    // api: route book and visits
    // api: analytics
    // api: imports and exports
    // api: mail
  ]),
] satisfies RouteConfig;
