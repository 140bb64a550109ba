import { type RouteConfig, index, prefix, route } from "@react-router/dev/routes";

export default [
  index("routes/home.tsx"),

  // Accounts
  route("sign-in", "routes/sign-in.tsx"),
  route("sign-up", "routes/sign-up.tsx"),
  route("sign-out", "routes/sign-out.ts"),
  route("verify-email", "routes/verify-email.tsx"),
  route("forgot-password", "routes/forgot-password.tsx"),
  route("reset-password", "routes/reset-password.tsx"),
  route("accept-invite", "routes/accept-invite.tsx"),
  route("account", "routes/account.tsx"),

  // Staff and administration
  route("staff", "routes/staff.tsx"),
  ...prefix("admin", [route("users", "routes/admin.users.tsx")]),

  // Notices (local navigational warnings): board, list, pages, bulletin, feeds, API, staff editor
  route("notices", "routes/notices.tsx"),
  route("notices/:id", "routes/notices.id.tsx"),
  route("notices/:id/gpx", "routes/notices.gpx.ts"),
  route("bulletin", "routes/bulletin.tsx"),
  route("feeds", "routes/feeds.tsx"),
  route("feeds/notices.atom", "routes/feeds.notices.atom.ts"),
  route("api/v1/notices", "routes/api.v1.notices.ts"),
  route("api/v1/notices/:id", "routes/api.v1.notices.id.ts"),
  route("staff/notices", "routes/staff.notices.tsx"),
  route("staff/notices/new", "routes/staff.notices.new.tsx"),
  route("staff/notices/:id/edit", "routes/staff.notices.edit.tsx"),

  // Subscriptions (alerts and digests by e-mail)
  route("subscribe", "routes/subscribe.tsx"),
  route("subscribe/sent", "routes/subscribe.sent.tsx"),
  route("subscribe/confirm", "routes/subscribe.confirm.tsx"),
  route("subscriptions/manage", "routes/subscriptions.manage.tsx"),
  route("unsubscribe", "routes/unsubscribe.tsx"),
  route("account/subscriptions", "routes/account.subscriptions.tsx"),
  route("staff/mail", "routes/staff.mail.tsx"),

  // Aids register and discrepancy reports
  route("report", "routes/report.tsx"),
  route("reports/:id", "routes/reports.detail.tsx"),
  route("account/reports", "routes/account.reports.tsx"),
  route("staff/reports", "routes/staff.reports.tsx"),
  route("staff/reports/aid/:aidId", "routes/staff.reports.aid.tsx"),
  route("staff/aids", "routes/staff.aids.tsx"),
  route("staff/aids.csv", "routes/staff.aids.csv.ts"),
  route("staff/aids/import", "routes/staff.aids.import.tsx"),
  route("staff/aids/:aidId", "routes/staff.aids.edit.tsx"),
  route("photos/:id/:size", "routes/photos.ts"),
  route("api/v1/aids", "routes/api.v1.aids.ts"),
  route("api/v1/reports", "routes/api.v1.reports.ts"),
  route("api/v1/uploads", "routes/api.v1.uploads.ts"),
  route("api/v1/uploads/:id/complete", "routes/api.v1.uploads.complete.ts"),

  // Position tools and their JSON API (app/lib/geo)
  route("tools", "routes/tools.tsx"),
  route("api/v1/convert", "routes/api.v1.convert.ts"),
  route("api/v1/measure", "routes/api.v1.measure.ts"),
  route("api/v1/assessments", "routes/api.v1.assessments.ts"),

  // Operations
  route("healthz", "routes/healthz.ts"),

  route("*", "routes/not-found.tsx"),
] satisfies RouteConfig;
