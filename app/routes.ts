import { type RouteConfig, index, prefix, route } from "@react-router/dev/routes";

// Every route here must also be classified in tests/e2e/route-access.ts (who may see it).
export default [
  index("routes/home.tsx"),
  route("cautions", "routes/cautions.tsx"),
  route("checklist/export.csv", "routes/checklist/export.ts"),
  ...prefix("checklist", [
    index("routes/checklist/checklist.tsx"),
    route("new", "routes/checklist/new.tsx"),
    route("import", "routes/checklist/import.tsx"),
    route(":taxonId", "routes/checklist/taxon.tsx"),
    route(":taxonId/edit", "routes/checklist/edit.tsx"),
  ]),
  route("login", "routes/auth/login.tsx"),
  route("logout", "routes/auth/logout.ts"),
  route("account", "routes/auth/account.tsx"),
  route("invite/:token", "routes/auth/invite.tsx"),
  route("forgot-password", "routes/auth/forgot-password.tsx"),
  route("reset-password/:token", "routes/auth/reset-password.tsx"),
  route("signup", "routes/auth/signup.tsx"),
  route("confirm-email/:token", "routes/auth/confirm-email.tsx"),
  ...prefix("visits", [
    index("routes/visits/visits.tsx"),
    route("new", "routes/visits/new.tsx"),
    route(":visitId", "routes/visits/visit.tsx"),
  ]),
  route("photos/:photoId", "routes/visits/photo.ts"),
  route("determinations", "routes/determinations/queue.tsx"),
  route("admin/users", "routes/admin/users.tsx"),
  route("dev/mail", "routes/dev/mail.tsx"),
  ...prefix("api", [
    route("taxa", "routes/api/taxa.ts"),
    route("taxa/search", "routes/api/taxa-search.ts"),
    route("me", "routes/api/me.ts"),
    route("visits", "routes/api/visits.ts"),
    route("visits/:id", "routes/api/visit.ts"),
    route("visits/:id/determinations", "routes/api/visit-determinations.ts"),
    route("photos/uploads", "routes/api/photo-uploads.ts"),
  ]),
  route("*", "routes/not-found.tsx"),
] satisfies RouteConfig;
