import { type RouteConfig, index, route } from "@react-router/dev/routes";

export default [
  index("routes/home.tsx"),
  route("sign-in", "routes/sign-in.tsx"),
  route("sign-out", "routes/sign-out.tsx"),
  route("profile", "routes/profile.tsx"),
  route("admin/users", "routes/admin.users.tsx"),
  route("api/me", "routes/api.me.ts"),
  route("*", "routes/not-found.tsx"),
] satisfies RouteConfig;
