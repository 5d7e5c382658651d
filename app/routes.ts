import { type RouteConfig, index, route } from "@react-router/dev/routes";

export default [
  index("routes/library.tsx"),
  route("guides/:slug", "routes/guide.tsx"),
  route("tools/circuit", "routes/tools.circuit.tsx"),
  route("media/*", "routes/media.ts"),
  route("dev/inbox", "routes/dev.inbox.tsx"),
  route("api/catalogue", "routes/api.catalogue.ts"),
  route("api/guides", "routes/api.guides.ts"),
  route("api/guides/:slug", "routes/api.guide.ts"),
  route("api/circuit", "routes/api.circuit.ts"),
  route("*", "routes/not-found.tsx"),
] satisfies RouteConfig;
