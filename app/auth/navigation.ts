import { hasAnyRole, type Role } from "./roles";

export interface NavigationItem {
  to: string;
  label: string;
  /** Who sees it: "anyone", "signed-in", or the roles (a coordinator sees every item). */
  audience: "anyone" | "signed-in" | readonly Role[];
}

/** The main navigation; each capability adds its pages here with the roles that may use them. */
export const NAVIGATION: NavigationItem[] = [
  { to: "/visits/new", label: "Record", audience: ["recorder"] },
  { to: "/visits", label: "Visits", audience: ["recorder"] },
  { to: "/determinations", label: "Determine", audience: ["botanist", "bee_verifier"] },
  { to: "/forage/ranking", label: "Forage", audience: "signed-in" },
  { to: "/season", label: "Season", audience: "signed-in" },
  { to: "/floral-counts", label: "Flower counts", audience: ["recorder", "botanist"] },
  { to: "/planting", label: "Planting", audience: ["planner"] },
  { to: "/nursery", label: "Nursery stock", audience: ["nursery"] },
  { to: "/checklist", label: "Checklist", audience: "anyone" },
  { to: "/exchange", label: "Export", audience: ["planner"] },
  { to: "/admin/users", label: "People", audience: ["coordinator"] },
  { to: "/admin/seasons", label: "Seasons", audience: ["coordinator"] },
  { to: "/cautions", label: "Cautions", audience: "anyone" },
];

/** What the navigation shows to someone with these roles (null: not signed in). */
export function navigationFor(roles: readonly Role[] | null): NavigationItem[] {
  return NAVIGATION.filter((item) => {
    if (item.audience === "anyone") return true;
    if (roles === null) return false;
    if (item.audience === "signed-in") return true;
    return hasAnyRole(roles, item.audience);
  });
}
