import { type RouteConfig, index, route } from "@react-router/dev/routes";

export default [
  index("routes/home.tsx"),
  // accounts
  route("sign-in", "routes/sign-in.tsx"),
  route("sign-up", "routes/sign-up.tsx"),
  route("sign-out", "routes/sign-out.tsx"),
  route("check-your-mail", "routes/check-your-mail.tsx"),
  route("welcome", "routes/welcome.tsx"),
  route("forgot-password", "routes/forgot-password.tsx"),
  route("reset-password", "routes/reset-password.tsx"),
  // role homes
  route("events", "routes/events.tsx"),
  route("my/entries", "routes/my.entries.tsx"),
  route("judging", "routes/judging.tsx"),
  route("organize", "routes/organize.tsx"),
  route("admin", "routes/admin.tsx"),
  // JSON API
  route("api/auth/*", "routes/api.auth.ts"),
  route("api/me", "routes/api.me.ts"),
  // everything else
  route("*", "routes/not-found.tsx"),
] satisfies RouteConfig;
