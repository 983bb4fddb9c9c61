import type { Role } from "~/auth/roles";

/**
 * Who may see each route of app/routes.ts. A route missing here fails the matrix test, so a
 * new page cannot ship unclassified.
 *
 * - "anyone": everyone gets 200.
 * - "signed-in": anonymous pages redirect to /login?next=…, anonymous API calls get 401.
 * - roles: as signed-in, and a user without one of the roles gets 403 (a coordinator passes).
 * - "anonymous": the sign-in page: 200 for anonymous, a redirect once signed in.
 * - "redirect": always a redirect (GET /logout).
 * - "missing": 404 for everyone.
 */
export type Access = "anyone" | "signed-in" | readonly Role[] | "anonymous" | "redirect" | "missing";

export interface RouteAccess {
  /** A URL that exercises the route's loader. */
  sample: string;
  access: Access;
  /** A form the route's action accepts, to check writes are refused to the same people. */
  write?: Record<string, string>;
  /** What an allowed viewer gets, when not 200 (a redirect to storage, a 405 for GET). */
  okStatus?: number;
}

export const ROUTE_ACCESS: Record<string, RouteAccess> = {
  "routes/home.tsx": { sample: "/", access: "anyone" },
  "routes/cautions.tsx": { sample: "/cautions", access: "anyone" },
  "routes/checklist/checklist.tsx": { sample: "/checklist", access: "anyone" },
  "routes/checklist/taxon.tsx": { sample: "/checklist/1", access: "anyone" },
  "routes/checklist/export.ts": { sample: "/checklist/export.csv", access: "anyone" },
  // The writes below are refused before they are read; allowed viewers are not sent them.
  "routes/checklist/new.tsx": { sample: "/checklist/new", access: ["botanist"], write: { intent: "save", scientificName: "Matrix testii" } },
  "routes/checklist/edit.tsx": { sample: "/checklist/1/edit", access: ["botanist"], write: { intent: "save", scientificName: "Matrix testii" } },
  "routes/checklist/import.tsx": { sample: "/checklist/import", access: ["botanist"], write: { intent: "preview", csv: "scientificName\n" } },
  "routes/auth/login.tsx": { sample: "/login", access: "anonymous" },
  "routes/auth/logout.ts": { sample: "/logout", access: "redirect" },
  "routes/auth/account.tsx": { sample: "/account", access: "signed-in", write: { intent: "create-token", label: "matrix test" } },
  // A made-up token: the page says the link cannot be used; it is open to anyone with a link.
  "routes/auth/invite.tsx": { sample: "/invite/not-a-real-token", access: "anyone" },
  "routes/auth/forgot-password.tsx": { sample: "/forgot-password", access: "anyone" },
  "routes/auth/reset-password.tsx": { sample: "/reset-password/not-a-real-token", access: "anyone" },
  // Open to anyone; says "by invitation" while the programme's setting keeps sign-up closed.
  "routes/auth/signup.tsx": { sample: "/signup", access: "anyone" },
  "routes/auth/confirm-email.tsx": { sample: "/confirm-email/not-a-real-token", access: "anyone" },
  "routes/visits/visits.tsx": { sample: "/visits", access: ["recorder"] },
  "routes/visits/new.tsx": { sample: "/visits/new", access: ["recorder"], write: { clientSubmissionId: "00000000-0000-4000-8000-000000000000" } },
  // Visit 1 of the demo seed belongs to the demo recorder; verifiers see visits to determine them.
  "routes/visits/visit.tsx": { sample: "/visits/1", access: ["recorder", "botanist", "bee_verifier"] },
  // Allowed viewers are sent on to a short-lived storage URL.
  "routes/visits/photo.ts": { sample: "/photos/1", access: ["recorder", "botanist", "bee_verifier"], okStatus: 302 },
  "routes/api/visits.ts": { sample: "/api/visits", access: "signed-in" },
  "routes/api/visit.ts": { sample: "/api/visits/1", access: ["recorder", "botanist", "bee_verifier"] },
  // POST only: a GET from an allowed caller is told to use POST.
  "routes/api/photo-uploads.ts": { sample: "/api/photos/uploads", access: ["recorder"], okStatus: 405, write: { contentType: "image/jpeg" } },
  "routes/determinations/queue.tsx": { sample: "/determinations", access: ["botanist", "bee_verifier"], write: { visitId: "1", subject: "plant", action: "confirm", version: "1" } },
  // POST only; a GET from an allowed caller is told where the history is.
  "routes/api/visit-determinations.ts": { sample: "/api/visits/1/determinations", access: ["botanist", "bee_verifier"], okStatus: 405, write: { subject: "plant" } },
  "routes/forage/matrix.tsx": { sample: "/forage", access: "signed-in" },
  "routes/forage/ranking.tsx": { sample: "/forage/ranking", access: "signed-in" },
  "routes/forage/season.tsx": { sample: "/season", access: "signed-in" },
  "routes/floral-counts/floral-counts.tsx": { sample: "/floral-counts", access: ["recorder", "botanist"] },
  "routes/floral-counts/new.tsx": { sample: "/floral-counts/new", access: ["recorder", "botanist"], write: { siteId: "1" } },
  "routes/admin/seasons.tsx": { sample: "/admin/seasons", access: ["coordinator"], write: { intent: "save" } },
  "routes/api/forage-matrix.ts": { sample: "/api/forage/matrix", access: "signed-in" },
  "routes/api/forage-ranking.ts": { sample: "/api/forage/ranking", access: "signed-in" },
  "routes/api/forage-season.ts": { sample: "/api/forage/season", access: "signed-in" },
  "routes/planting/planting.tsx": { sample: "/planting", access: ["planner"], write: { intent: "save" } },
  "routes/planting/list.tsx": { sample: "/planting/lists/999999", access: ["planner"], okStatus: 404 },
  "routes/planting/print.tsx": { sample: "/planting/lists/999999/print", access: ["planner"], okStatus: 404 },
  "routes/planting/export.ts": { sample: "/planting/lists/999999/export.csv", access: ["planner"], okStatus: 404 },
  "routes/planting/shared.tsx": { sample: "/planting/shared/not-a-real-token", access: "missing" },
  "routes/nursery/nursery.tsx": { sample: "/nursery", access: ["nursery"], write: { intent: "add" } },
  "routes/nursery/import.tsx": { sample: "/nursery/import", access: ["nursery"], write: { intent: "preview", csv: "scientificName\n" } },
  "routes/nursery/export.ts": { sample: "/nursery/stock.csv", access: ["nursery"] },
  "routes/api/planting-recommendation.ts": { sample: "/api/planting/recommendation?band=north", access: "signed-in" },
  "routes/api/planting-list.ts": { sample: "/api/planting/lists/999999", access: ["planner"], okStatus: 404 },
  "routes/api/nursery-stock.ts": { sample: "/api/nursery/stock", access: ["nursery"] },
  "routes/exchange/exchange.tsx": { sample: "/exchange", access: ["planner"] },
  "routes/exchange/occurrences.ts": { sample: "/exchange/occurrences.csv", access: ["planner"] },
  "routes/exchange/archive.ts": { sample: "/exchange/archive.zip", access: ["planner"] },
  "routes/admin/users.tsx": { sample: "/admin/users", access: ["coordinator"], write: { intent: "invite", email: "matrix@example.org", roles: "recorder" } },
  "routes/dev/mail.tsx": { sample: "/dev/mail", access: ["coordinator"] },
  "routes/api/taxa.ts": { sample: "/api/taxa", access: "anyone" },
  "routes/api/taxa-search.ts": { sample: "/api/taxa/search?q=willow", access: "anyone" },
  "routes/api/me.ts": { sample: "/api/me", access: "signed-in" },
  "routes/not-found.tsx": { sample: "/no/such/page", access: "missing" },
};
