import { ROLES, roleAtLeast, type Role } from "../../app/.server/roles";

/**
 * The access matrix: who may call every loader (GET) and action (POST) of every route in
 * app/routes.ts, one line per route id, checked by tests/integration/access-matrix.test.ts.
 * The same URLs drive the API fuzzing and the accessibility walk.
 *
 * Adding a route? Add its line here; a route without one fails the suite.
 */

export type Actor = "anonymous" | Role | "outsider";
/** A status code, or "sign-in": a redirect to the sign-in page (401 JSON under /api/). */
export type Outcome = number | "sign-in";
export type Rule = (actor: Actor) => Outcome;
export type Body = { form: Record<string, string> } | { json: unknown };
export interface Fixtures {
  invitationId: string;
  /** The demo capture attached to CS-0006. */
  attachmentId: string;
}
export interface Entry {
  /** A concrete URL from the demo seed; it must match the route's pattern. */
  url: string | ((f: Fixtures) => string);
  get: Rule;
  /** Required when the module exports an action. `{actor}` in a body value is replaced by the actor's name. */
  post?: { rule: Rule; body: Body; url?: string; endsSession?: boolean };
}

export const ACTORS: Actor[] = ["anonymous", ...ROLES, "outsider"];

/** Everyone gets `status`. */
const anyone = (status: number): Rule => () => status;
/** Pages for people not signed in: `guest` for them, `member` (a redirect onward) once signed in. */
const guests = (guest: number, member: number): Rule => (a) => (a === "anonymous" ? guest : member);
/** Any signed-in account, team or not (requireUser). */
const signedIn = (ok: number): Rule => (a) => (a === "anonymous" ? "sign-in" : ok);
/** At least `min` in the caller's own team (requireMember); the outsider is admin of a team of their own. */
const role = (min: Role, ok: number): Rule => (a) => (a === "anonymous" ? "sign-in" : roleAtLeast(a === "outsider" ? "admin" : a, min) ? ok : 403);
/** A record of the demo team: as `role`, and 404 for a member of another team. */
const teamRecord = (min: Role, ok: number): Rule => (a) => (a === "outsider" ? 404 : role(min, ok)(a));

const form = (fields: Record<string, string>): Body => ({ form: fields });
const json = (body: unknown): Body => ({ json: body });
const comment = form({ intent: "comment", anchor: "sheet", body: "Access-matrix note from {actor}." });
/** Names a document that is not this one: passes the access check, then fails validation, changing nothing. */
const citationUpdate = form({ intent: "update-citation", documentId: "another-document", sheet: "CS-0001", rev: "A" });

export const ACCESS_MATRIX: Record<string, Entry> = {
  "routes/home": { url: "/", get: anyone(200) },
  "routes/sign-in": { url: "/sign-in", get: guests(200, 302), post: { rule: guests(400, 302), body: form({ email: "nobody@example.org", password: "not-the-password", next: "" }) } },
  "routes/sign-up": { url: "/sign-up", get: guests(200, 302), post: { rule: guests(400, 302), body: form({ name: "", email: "not-an-address", password: "short", next: "" }) } },
  "routes/sign-out": { url: "/sign-out", get: anyone(302), post: { rule: anyone(302), body: form({}), endsSession: true } },
  "routes/forgot-password": { url: "/forgot-password", get: anyone(200), post: { rule: anyone(200), body: form({ email: "nobody@example.org" }) } },
  "routes/reset-password": { url: "/reset-password?token=not-a-token", get: anyone(200), post: { rule: anyone(400), body: form({ token: "not-a-token", password: "long-enough-password", confirm: "long-enough-password" }) } },
  "routes/invitation": { url: (f) => `/invitations/${f.invitationId}`, get: anyone(200), post: { rule: signedIn(400), body: form({}) } },
  "routes/healthz": { url: "/healthz", get: anyone(200) },
  "routes/api.auth.$": { url: "/api/auth/get-session", get: anyone(200), post: { rule: anyone(401), url: "/api/auth/sign-in/email", body: json({ email: "nobody@example.org", password: "not-the-password" }) } },
  "routes/dev.mail": { url: "/dev/mail", get: anyone(404) },
  "routes/app-layout": { url: "/sheets", get: role("viewer", 200) },
  "routes/teams.new": { url: "/teams/new", get: signedIn(200), post: { rule: signedIn(400), body: form({ name: "" }) } },
  "routes/teams.switch": { url: "/teams/switch", get: signedIn(302), post: { rule: signedIn(403), body: form({ teamId: "not-a-team-of-yours" }) } },
  "routes/sheets": { url: "/sheets", get: role("viewer", 200) },
  "routes/sheets.new": { url: "/sheets/new", get: role("engineer", 200), post: { rule: role("engineer", 302), body: form({ title: "Access matrix sheet by {actor}", projectId: "", tags: "" }) } },
  sheet: { url: "/sheets/CS-0008", get: teamRecord("viewer", 200), post: { rule: teamRecord("engineer", 200), body: comment } },
  "sheet-revision": { url: "/sheets/CS-0008/revisions/A", get: teamRecord("viewer", 200), post: { rule: teamRecord("engineer", 200), body: comment } },
  "routes/sheets.$number.diff": { url: "/sheets/CS-0002/diff?from=A&to=B", get: teamRecord("viewer", 200) },
  "routes/sheets.$number.edit": { url: "/sheets/CS-0005/edit", get: teamRecord("engineer", 200), post: { rule: teamRecord("engineer", 200), body: form({ intent: "autosave", source: "# Draft by {actor}\n", baseRevisionId: "" }) } },
  "routes/sheets.$number.attachments.$attachmentId": { url: (f) => `/sheets/CS-0006/attachments/${f.attachmentId}`, get: teamRecord("viewer", 200) },
  "routes/documents.new": { url: "/documents/new", get: role("engineer", 200), post: { rule: role("engineer", 400), body: form({ title: "Access matrix document by {actor}", projectId: "" }) } },
  document: { url: "/documents/PD-0001", get: teamRecord("viewer", 200), post: { rule: teamRecord("engineer", 400), body: citationUpdate } },
  "document-version": { url: "/documents/PD-0001/versions/1", get: teamRecord("viewer", 200), post: { rule: teamRecord("engineer", 400), body: citationUpdate } },
  "routes/documents.$number.edit": { url: "/documents/PD-0001/edit", get: teamRecord("engineer", 200), post: { rule: teamRecord("engineer", 200), body: form({ intent: "autosave", source: "# Draft by {actor}\n", baseVersionId: "" }) } },
  "routes/projects": { url: "/projects", get: role("viewer", 200), post: { rule: role("engineer", 302), body: form({ code: "AM-{actor}", name: "Access matrix project", client: "", description: "" }) } },
  "routes/projects.$code": { url: "/projects/GPU-400", get: teamRecord("viewer", 200), post: { rule: teamRecord("engineer", 200), body: form({ code: "GPU-400", name: "400 Hz ground-power unit, 30 kVA", client: "Tarrowfield Airfield Services", description: "Edited by the access matrix ({actor})." }) } },
  "routes/search": { url: "/search?q=filter", get: role("viewer", 200) },
  "routes/desk": { url: "/desk", get: role("viewer", 200), post: { rule: role("viewer", 200), body: form({}) } },
  "routes/team": { url: "/team", get: role("viewer", 200), post: { rule: role("admin", 200), body: form({ intent: "invite", email: "invited-by-{actor}@example.org", role: "viewer" }) } },
  "routes/settings": { url: "/settings", get: role("viewer", 200), post: { rule: role("viewer", 200), body: form({ intent: "create-key", name: "key of {actor}" }) } },
  "routes/calculators": { url: "/calculators", get: role("viewer", 200) },
  "routes/api.v1.calculators": { url: "/api/v1/calculators", get: role("viewer", 200), post: { rule: role("viewer", 405), body: json({}) } },
  "routes/api.v1.calculators.$calculatorId.evaluate": { url: "/api/v1/calculators/quasi-square/evaluate", get: role("viewer", 405), post: { rule: role("viewer", 200), body: json({ inputs: { vdc: "48 V", alpha: "30 deg" } }) } },
  "routes/api.v1.evaluate": { url: "/api/v1/evaluate", get: role("viewer", 405), post: { rule: role("viewer", 200), body: json({ blocks: [{ id: "qs1", calculator: "quasi-square", inputs: { vdc: "48 V", alpha: "30 deg" } }] }) } },
  "routes/api.v1.search": { url: "/api/v1/search?q=filter", get: role("viewer", 200), post: { rule: role("viewer", 405), body: json({}) } },
  "routes/api.v1.blocks": { url: "/api/v1/blocks?calculator=lc-filter&field=f0&min=1%20kHz&max=3%20kHz", get: role("viewer", 200), post: { rule: role("viewer", 405), body: json({}) } },
  "routes/api.v1.sheets.$number.revisions.$rev": { url: "/api/v1/sheets/CS-0001/revisions/A", get: teamRecord("viewer", 200), post: { rule: role("viewer", 405), body: json({}) } },
  "routes/api.v1.sheets.$number.attachments": { url: "/api/v1/sheets/CS-0006/attachments", get: teamRecord("viewer", 200), post: { rule: teamRecord("engineer", 400), body: json({}) } },
  "api-not-found": { url: "/api/v1/no-such-endpoint", get: anyone(404), post: { rule: anyone(404), body: json({}) } },
  "routes/not-found": { url: "/no-such-page", get: anyone(404) },
};

/** The entry's URL with the fixtures filled in. */
export function entryUrl(entry: Entry, fixtures: Fixtures): string {
  return typeof entry.url === "string" ? entry.url : entry.url(fixtures);
}
