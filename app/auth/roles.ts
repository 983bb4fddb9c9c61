/** The roles of a monitoring programme. A user may hold several. */
export const ROLES = ["recorder", "botanist", "bee_verifier", "planner", "nursery", "coordinator"] as const;
export type Role = (typeof ROLES)[number];

export const ROLE_LABELS: Record<Role, string> = {
  recorder: "Recorder",
  botanist: "Botanist",
  bee_verifier: "Bee verifier",
  planner: "Planner",
  nursery: "Nursery",
  coordinator: "Coordinator",
};

export const ROLE_DUTIES: Record<Role, string> = {
  recorder: "records flower visits",
  botanist: "determines plants and keeps the checklist",
  bee_verifier: "confirms or corrects bees and castes from photos",
  planner: "reads forage results and builds planting lists",
  nursery: "keeps a stock list",
  coordinator: "runs the programme; can do what every role can",
};

/** A coordinator can do what every other role can. */
export function hasAnyRole(userRoles: readonly Role[], allowed: readonly Role[]): boolean {
  if (userRoles.includes("coordinator")) return true;
  return allowed.some((role) => userRoles.includes(role));
}
