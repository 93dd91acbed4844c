import { type RouteConfig, index, layout, prefix, route } from "@react-router/dev/routes";

export default [
  index("routes/home.tsx"),
  route("login", "routes/login.tsx"),
  route("logout", "routes/logout.tsx"),
  route("c/:companySlug", "routes/company-public.tsx"),

  ...prefix("app", [
    layout("routes/app-layout.tsx", [
      index("routes/app-index.tsx"),
      route("catalog", "routes/app-catalog.tsx"),
      route("catalog/new", "routes/app-catalog-item.tsx", { id: "catalog-new" }),
      route("catalog/:itemId", "routes/app-catalog-item.tsx", { id: "catalog-edit" }),
      route("settings", "routes/app-settings.tsx"),
    ]),
  ]),

  ...prefix("api", [
    route("health", "routes/api/health.ts"),
    route("catalog/:companySlug", "routes/api/catalog.ts"),
  ]),

  route("*", "routes/not-found.tsx"),
] satisfies RouteConfig;
