import { type RouteConfig, index, layout, prefix, route } from "@react-router/dev/routes";

export default [
  index("routes/home.tsx"),
  route("login", "routes/login.tsx"),
  route("logout", "routes/logout.tsx"),
  route("c/:companySlug", "routes/configurator.tsx"),
  route("c/:companySlug/sent/:ref", "routes/request-sent.tsx"),
  route("c/:companySlug/consult/:ref", "routes/consult.tsx"),
  route("c/:companySlug/consult/:ref/done", "routes/consult-done.tsx"),
  route("welcome/:token?", "routes/welcome.tsx"),
  route("my", "routes/my.tsx"),
  route("p/:token", "routes/proposal.tsx"),
  route("p/:token.pdf", "routes/proposal-pdf.ts"),
  route("p/:token/opened", "routes/proposal-opened.ts"),
  route("photos/:photoId", "routes/photo.ts"),

  ...prefix("app", [
    layout("routes/app-layout.tsx", [
      index("routes/app-index.tsx"),
      route("catalog", "routes/app-catalog.tsx"),
      route("catalog/new", "routes/app-catalog-item.tsx", { id: "catalog-new" }),
      route("catalog/:itemId", "routes/app-catalog-item.tsx", { id: "catalog-edit" }),
      route("settings", "routes/app-settings.tsx"),
      route("settings/factors", "routes/app-factors.tsx"),
      route("settings/proposals", "routes/app-settings-proposals.tsx"),
      route("inbox", "routes/app-inbox.tsx"),
      route("leads/:leadId", "routes/app-lead.tsx"),
      route("leads/:leadId/design", "routes/app-lead-design.tsx"),
      route("leads/:leadId/visit", "routes/app-lead-visit.tsx"),
      route("leads/:leadId/proposal", "routes/app-lead-proposal.tsx"),
      route("leads/:leadId/change-order", "routes/app-lead-change-order.tsx"),
      route("jobs", "routes/app-jobs.tsx"),
      route("team", "routes/app-team.tsx"),
      route("schedule", "routes/app-schedule.tsx"),
      route("consult-hours", "routes/app-consult-hours.tsx"),
      route("attention", "routes/app-attention.tsx"),
    ]),
    route("inbox.csv", "routes/app-inbox-csv.ts"),
    route("inbox/seen", "routes/app-inbox-seen.ts"),
    route("leads/:leadId/cut-sheet", "routes/app-lead-cut-sheet.tsx"),
    route("leads/:leadId/cut-sheet.pdf", "routes/app-lead-cut-sheet-pdf.ts"),
  ]),

  ...prefix("api", [
    route("health", "routes/api/health.ts"),
    route("catalog/:companySlug", "routes/api/catalog.ts"),
    route("plan", "routes/api/plan.ts"),
    route("leads", "routes/api/leads.ts"),
    route("webhooks/stripe", "routes/api/webhooks-stripe.ts"),
  ]),

  route("*", "routes/not-found.tsx"),
] satisfies RouteConfig;
