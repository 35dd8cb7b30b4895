import { index, layout, prefix, route, type RouteConfig } from "@react-router/dev/routes";

export default [
  route("sign-in", "routes/sign-in.tsx"),
  route("sign-out", "routes/sign-out.tsx"),
  // mail and invitations: public pages (invitation links, password reset, unsubscribe)
  route("invite/:token", "routes/invite.tsx"),
  route("forgot-password", "routes/forgot-password.tsx"),
  route("reset-password", "routes/reset-password.tsx"),
  route("unsubscribe/:token", "routes/unsubscribe.tsx"),

  layout("routes/app-layout.tsx", [
    index("routes/home.tsx"),
    route("team", "routes/team.tsx"),
    route("settings", "routes/settings.tsx"),
    // route book and visits
    route("visit", "routes/visit.tsx"),
    route("visit/:poolId", "routes/visit-pool.tsx"),
    route("pools", "routes/pools.tsx"),
    route("pools/new", "routes/pool-new.tsx"),
    route("pools/:poolId", "routes/pool.tsx"),
    route("pools/:poolId/edit", "routes/pool-edit.tsx"),
    route("routes", "routes/route-list.tsx"),
    route("routes/new", "routes/route-new.tsx"),
    route("routes/:routeId/edit", "routes/route-edit.tsx"),
    route("sources", "routes/sources.tsx"),
    route("sources/new", "routes/source-new.tsx"),
    route("sources/health", "routes/source-health.tsx"), // analytics; listed before sources/:sourceId
    route("sources/:sourceId", "routes/source.tsx"),
    route("sources/:sourceId/edit", "routes/source-edit.tsx"),
    route("products", "routes/products.tsx"),
    route("products/new", "routes/product-new.tsx"),
    route("products/:productId/edit", "routes/product-edit.tsx"),
    // analytics
    route("overview", "routes/analytics-overview.tsx"),
    route("risk", "routes/analytics-risk.tsx"),
    route("recurring", "routes/analytics-recurring.tsx"),
    route("outcomes", "routes/analytics-outcomes.tsx"),
    // imports and exports
    route("imports", "routes/imports.tsx"),
    route("imports/new", "routes/imports-new.tsx"),
    route("imports/:uploadId", "routes/import-check.tsx"),
    route("exports", "routes/exports.tsx"),
    // mail and invitations: signed-in pages
    route("team/invitations", "routes/team-invitations.tsx"),
    route("mailbox", "routes/mailbox.tsx"),
    route("mailbox/:messageId", "routes/mailbox-message.tsx"),
  ]),

  route("api/auth/*", "routes/api/auth.ts"),
  layout("routes/api/members.ts", prefix("api", [
    route("summary", "routes/api/summary.ts"),
    route("pools/:poolId", "routes/api/pool.ts"),
    // api: route book and visits
    // api: analytics
    route("analytics/summary", "routes/api/analytics/summary.ts"),
    route("analytics/trend", "routes/api/analytics/trend.ts"),
    route("analytics/groups", "routes/api/analytics/groups.ts"),
    route("analytics/recurring", "routes/api/analytics/recurring.ts"),
    route("analytics/alerts", "routes/api/analytics/alerts.ts"),
    route("analytics/sources", "routes/api/analytics/sources.ts"),
    route("analytics/outcomes", "routes/api/analytics/outcomes.ts"),
    route("analytics/pools/:poolId/series", "routes/api/analytics/pool-series.ts"),
    route("analytics/pools/:poolId/evidence", "routes/api/analytics/pool-evidence.ts"),
    // api: imports and exports
    route("imports/uploads", "routes/api/import-uploads.ts"),
    route("imports/:uploadId", "routes/api/import-upload.ts"),
    route("imports/:uploadId/refused.csv", "routes/api/import-refused.ts"),
    route("exports/:dataset", "routes/api/export.ts"),
    // api: mail
  ])),
] satisfies RouteConfig;
