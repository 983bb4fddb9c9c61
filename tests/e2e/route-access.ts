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
}

export const ROUTE_ACCESS: Record<string, RouteAccess> = {
  "routes/home.tsx": { sample: "/", access: "anyone" },
  "routes/cautions.tsx": { sample: "/cautions", access: "anyone" },
  "routes/checklist/checklist.tsx": { sample: "/checklist", access: "anyone" },
  "routes/checklist/taxon.tsx": { sample: "/checklist/1", access: "anyone" },
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
  "routes/admin/users.tsx": { sample: "/admin/users", access: ["coordinator"], write: { intent: "invite", email: "matrix@example.org", roles: "recorder" } },
  "routes/dev/mail.tsx": { sample: "/dev/mail", access: ["coordinator"] },
  "routes/api/taxa.ts": { sample: "/api/taxa", access: "anyone" },
  "routes/api/taxa-search.ts": { sample: "/api/taxa/search?q=willow", access: "anyone" },
  "routes/api/me.ts": { sample: "/api/me", access: "signed-in" },
  "routes/not-found.tsx": { sample: "/no/such/page", access: "missing" },
};
