import { type RouteConfig, index, layout, prefix, route } from "@react-router/dev/routes";

export default [
  index("routes/home.tsx"),
  route("sign-in", "routes/sign-in.tsx"),
  route("sign-up", "routes/sign-up.tsx"),
  route("sign-out", "routes/sign-out.tsx"),
  route("forgot-password", "routes/forgot-password.tsx"),
  route("reset-password", "routes/reset-password.tsx"),
  route("invitations/:invitationId", "routes/invitation.tsx"),
  route("healthz", "routes/healthz.ts"),
  route("api/auth/*", "routes/api.auth.$.ts"),
  route("dev/mail", "routes/dev.mail.tsx"),

  layout("routes/app-layout.tsx", [
    route("teams/new", "routes/teams.new.tsx"),
    route("teams/switch", "routes/teams.switch.ts"),
    route("sheets", "routes/sheets.tsx"),
    route("sheets/new", "routes/sheets.new.tsx"),
    route("sheets/:number", "routes/sheets.$number.tsx", { id: "sheet" }),
    route("sheets/:number/revisions/:rev", "routes/sheets.$number.tsx", { id: "sheet-revision" }),
    route("sheets/:number/diff", "routes/sheets.$number.diff.tsx"),
    route("sheets/:number/edit", "routes/sheets.$number.edit.tsx"),
    route("documents/new", "routes/documents.new.tsx"),
    route("documents/:number", "routes/documents.$number.tsx", { id: "document" }),
    route("documents/:number/versions/:version", "routes/documents.$number.tsx", { id: "document-version" }),
    route("documents/:number/edit", "routes/documents.$number.edit.tsx"),
    route("projects", "routes/projects.tsx"),
    route("projects/:code", "routes/projects.$code.tsx"),
    route("search", "routes/search.tsx"),
    route("desk", "routes/desk.tsx"),
    route("team", "routes/team.tsx"),
    route("settings", "routes/settings.tsx"),
    route("calculators", "routes/calculators.tsx"),
  ]),

  ...prefix("api/v1", [
    route("calculators", "routes/api.v1.calculators.ts"),
    route("calculators/:calculatorId/evaluate", "routes/api.v1.calculators.$calculatorId.evaluate.ts"),
    route("evaluate", "routes/api.v1.evaluate.ts"),
    route("search", "routes/api.v1.search.ts"),
    route("blocks", "routes/api.v1.blocks.ts"),
    route("sheets/:number/revisions/:rev", "routes/api.v1.sheets.$number.revisions.$rev.ts"),
  ]),

  route("api/*", "routes/api.not-found.ts", { id: "api-not-found" }),
  route("*", "routes/not-found.tsx"),
] satisfies RouteConfig;
