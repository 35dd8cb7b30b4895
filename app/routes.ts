import { index, layout, prefix, route, type RouteConfig } from "@react-router/dev/routes";

export default [
  route("sign-in", "routes/sign-in.tsx"),
  route("sign-out", "routes/sign-out.tsx"),

  layout("routes/app-layout.tsx", [
    index("routes/home.tsx"),
    route("pools/:poolId", "routes/pool.tsx"),
    route("team", "routes/team.tsx"),
    route("settings", "routes/settings.tsx"),
  ]),

  ...prefix("api", [
    route("auth/*", "routes/api/auth.ts"),
    route("summary", "routes/api/summary.ts"),
    route("pools/:poolId", "routes/api/pool.ts"),
  ]),
] satisfies RouteConfig;
