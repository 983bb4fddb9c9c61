import { type RouteConfig, index, prefix, route } from "@react-router/dev/routes";

export default [
  index("routes/home.tsx"),
  route("cautions", "routes/cautions.tsx"),
  ...prefix("checklist", [
    index("routes/checklist/checklist.tsx"),
    route(":taxonId", "routes/checklist/taxon.tsx"),
  ]),
  ...prefix("api", [
    route("taxa", "routes/api/taxa.ts"),
    route("taxa/search", "routes/api/taxa-search.ts"),
  ]),
  route("*", "routes/not-found.tsx"),
] satisfies RouteConfig;
