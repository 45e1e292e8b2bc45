import { type RouteConfig, index, route } from "@react-router/dev/routes";

export default [
  index("routes/home.tsx"),
  route("sign-in", "routes/sign-in.tsx"),
  route("sign-out", "routes/sign-out.tsx"),
  route("profile", "routes/profile.tsx"),
  route("admin/users", "routes/admin.users.tsx"),
  route("api/me", "routes/api.me.ts"),
  route("events", "routes/events._index.tsx"),
  route("events.csv", "routes/events.csv.ts"),
  route("events/new", "routes/events.new.tsx"),
  route("events/:id", "routes/events.$id.tsx"),
  route("events/:id/edit", "routes/events.$id.edit.tsx"),
  route("api/totals", "routes/api.totals.ts"),
  route("api/events", "routes/api.events.ts"),
  route("api/events/:id", "routes/api.events.$id.ts"),
  route("*", "routes/not-found.tsx"),
] satisfies RouteConfig;
