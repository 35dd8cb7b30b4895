import { index, layout, prefix, route, type RouteConfig } from "@react-router/dev/routes";

export default [
  route("sign-in", "routes/sign-in.tsx"),
  route("sign-out", "routes/sign-out.tsx"),
  // mail and invitations: public pages (invitation links, password reset, unsubscribe)
  route("invite/:token", "routes/invite.$token.tsx"),
  route("forgot-password", "routes/forgot-password.tsx"),
  route("reset-password", "routes/reset-password.tsx"),
  route("unsubscribe/:token", "routes/unsubscribe.$token.tsx"),

  layout("routes/app-layout.tsx", [
    index("routes/_index.tsx"),
    route("team", "routes/team.tsx"),
    route("settings", "routes/settings.tsx"),
    // route book and visits
    route("visit", "routes/visit.tsx"),
    route("visit/:poolId", "routes/visit.$poolId.tsx"),
    route("pools", "routes/pools.tsx"),
    route("pools/new", "routes/pools.new.tsx"),
    route("pools/:poolId", "routes/pools.$poolId.tsx"),
    route("pools/:poolId/edit", "routes/pools.$poolId.edit.tsx"),
    route("routes", "routes/routes.tsx"),
    route("routes/new", "routes/routes.new.tsx"),
    route("routes/:routeId/edit", "routes/routes.$routeId.edit.tsx"),
    route("sources", "routes/sources.tsx"),
    route("sources/new", "routes/sources.new.tsx"),
    route("sources/health", "routes/sources.health.tsx"), // analytics; listed before sources/:sourceId
    route("sources/:sourceId", "routes/sources.$sourceId.tsx"),
    route("sources/:sourceId/edit", "routes/sources.$sourceId.edit.tsx"),
    route("products", "routes/products.tsx"),
    route("products/new", "routes/products.new.tsx"),
    route("products/:productId/edit", "routes/products.$productId.edit.tsx"),
    // analytics
    route("overview", "routes/overview.tsx"),
    route("risk", "routes/risk.tsx"),
    route("recurring", "routes/recurring.tsx"),
    route("outcomes", "routes/outcomes.tsx"),
    route("outlook", "routes/outlook.tsx"),
    // imports and exports
    route("imports", "routes/imports.tsx"),
    route("imports/new", "routes/imports.new.tsx"),
    route("imports/:uploadId", "routes/imports.$uploadId.tsx"),
    route("exports", "routes/exports.tsx"),
    // mail and invitations: signed-in pages
    route("team/invitations", "routes/team.invitations.tsx"),
    route("mailbox", "routes/mailbox.tsx"),
    route("mailbox/:messageId", "routes/mailbox.$messageId.tsx"),
  ]),

  route("api/auth/*", "routes/api.auth.$.ts"),
  layout("routes/api-layout.ts", prefix("api", [
    route("summary", "routes/api.summary.ts"),
    route("pools/:poolId", "routes/api.pools.$poolId.ts"),
    // analytics
    route("analytics/summary", "routes/api.analytics.summary.ts"),
    route("analytics/trend", "routes/api.analytics.trend.ts"),
    route("analytics/groups", "routes/api.analytics.groups.ts"),
    route("analytics/recurring", "routes/api.analytics.recurring.ts"),
    route("analytics/alerts", "routes/api.analytics.alerts.ts"),
    route("analytics/sources", "routes/api.analytics.sources.ts"),
    route("analytics/outcomes", "routes/api.analytics.outcomes.ts"),
    route("analytics/ahead", "routes/api.analytics.ahead.ts"),
    route("analytics/pools/:poolId/series", "routes/api.analytics.pools.$poolId.series.ts"),
    route("analytics/pools/:poolId/evidence", "routes/api.analytics.pools.$poolId.evidence.ts"),
    // imports and exports
    route("imports/uploads", "routes/api.imports.uploads.ts"),
    route("imports/:uploadId", "routes/api.imports.$uploadId.ts"),
    route("imports/:uploadId/refused.csv", "routes/api.imports.$uploadId.refused[.csv].ts"),
    route("exports/:dataset", "routes/api.exports.$dataset.ts"),
  ])),
] satisfies RouteConfig;
