import { and, asc, eq, isNull } from "drizzle-orm";
import { createContext, redirect, type MiddlewareFunction, type RouterContextProvider } from "react-router";
import { auth } from "./auth";
import { db } from "./db/client";
import { apiKey, member, organization, user } from "./db/schema";
import { hashApiKey } from "./api-keys";
import { noteSignedIn } from "./request-log";
import { isRole, roleAtLeast, type Role } from "./roles";

export interface SignedInUser {
  id: string;
  name: string;
  email: string;
}

export interface TeamMembership {
  teamId: string;
  teamName: string;
  teamSlug: string;
  role: Role;
}

/** Who is asking, in which team, with which role. Every loader and action gets one from requireMember. */
export interface Member {
  user: SignedInUser;
  team: TeamMembership;
  teams: TeamMembership[];
  /** How the request proved who it is. */
  via: "session" | "api-key";
}

function isApiRequest(request: Request): boolean {
  return new URL(request.url).pathname.startsWith("/api/");
}

function unauthorized(request: Request): Response {
  if (isApiRequest(request)) {
    return Response.json({ error: "Sign in, or send a personal API key as `Authorization: Bearer …`." }, { status: 401 });
  }
  const url = new URL(request.url);
  return redirect(`/sign-in?next=${encodeURIComponent(url.pathname + url.search)}`);
}

export function forbidden(request: Request, message: string): Response {
  if (isApiRequest(request)) return Response.json({ error: message }, { status: 403 });
  return new Response(message, { status: 403, statusText: "Forbidden" });
}

async function membershipsOf(userId: string): Promise<TeamMembership[]> {
  const rows = await db()
    .select({ teamId: organization.id, teamName: organization.name, teamSlug: organization.slug, role: member.role })
    .from(member)
    .innerJoin(organization, eq(member.organizationId, organization.id))
    .where(eq(member.userId, userId))
    .orderBy(asc(organization.name));
  return rows.filter((r) => isRole(r.role)).map((r) => ({ ...r, role: r.role as Role }));
}

/** "Last used" is shown to the minute; refreshing it on every call would make every API read a write. */
const LAST_USED_RESOLUTION_MS = 60_000;

async function fromApiKey(request: Request): Promise<{ user: SignedInUser; emailVerified: boolean; teamId: string; keyId: string } | null> {
  const header = request.headers.get("authorization");
  if (!header?.toLowerCase().startsWith("bearer ")) return null;
  const secret = header.slice(7).trim();
  if (!secret) return null;
  const [row] = await db()
    .select({ keyId: apiKey.id, teamId: apiKey.teamId, lastUsedAt: apiKey.lastUsedAt, id: user.id, name: user.name, email: user.email, emailVerified: user.emailVerified })
    .from(apiKey)
    .innerJoin(user, eq(apiKey.userId, user.id))
    .where(and(eq(apiKey.secretHash, hashApiKey(secret)), isNull(apiKey.revokedAt)))
    .limit(1);
  if (!row) return null;
  if (!row.lastUsedAt || Date.now() - row.lastUsedAt.getTime() > LAST_USED_RESOLUTION_MS) {
    await db().update(apiKey).set({ lastUsedAt: new Date() }).where(eq(apiKey.id, row.keyId));
  }
  return { user: { id: row.id, name: row.name, email: row.email }, emailVerified: row.emailVerified, teamId: row.teamId, keyId: row.keyId };
}

/** Who is asking, found once per request by `identify`; null when nobody is signed in. */
export interface Identity {
  user: SignedInUser;
  /** Whether the account has confirmed its e-mail address (joining a team needs it). */
  emailVerified: boolean;
  via: Member["via"];
  /** The personal API key the request carried, if that is how it proved who it is. */
  apiKeyId: string | null;
  teams: TeamMembership[];
  /** The team the request acts in: the session's active team, else the first; an API key's own team. */
  team: TeamMembership | null;
}

type ReadContext = Readonly<RouterContextProvider>;
const identityContext = createContext<() => Promise<Identity | null>>();

/**
 * Root middleware: makes who is asking findable once per request — a personal API key on /api/
 * routes, else better-auth's own session check (which reads, verifies and extends its cookie) —
 * with their teams, through router context for the layouts, loaders and actions. Looked up when
 * first asked (the health route never asks), then shared by everyone answering the request.
 */
export const identify: MiddlewareFunction<Response> = ({ request, context }, next) => {
  let identity: Promise<Identity | null> | undefined;
  context.set(identityContext, () => (identity ??= lookUpIdentity(request)));
  return next();
};

async function lookUpIdentity(request: Request): Promise<Identity | null> {
  const keyed = isApiRequest(request) ? await fromApiKey(request) : null;
  if (keyed) {
    noteSignedIn(keyed.user.id, "api-key");
    const teams = await membershipsOf(keyed.user.id);
    const team = teams.find((t) => t.teamId === keyed.teamId) ?? null;
    return { user: keyed.user, emailVerified: keyed.emailVerified, via: "api-key", apiKeyId: keyed.keyId, teams, team };
  }
  const session = await auth().api.getSession({ headers: request.headers });
  if (!session) return null;
  const { id, name, email } = session.user;
  noteSignedIn(id, "session");
  const teams = await membershipsOf(id);
  const team = teams.find((t) => t.teamId === session.session.activeOrganizationId) ?? teams[0] ?? null;
  // better-auth reads the session's user from the database (no cookie cache), so this is current.
  return { user: { id, name, email }, emailVerified: session.user.emailVerified, via: "session", apiKeyId: null, teams, team };
}

/** Who is asking, or null; never throws for anonymous requests. */
export function identityOf(context: ReadContext): Promise<Identity | null> {
  return context.get(identityContext)();
}

export async function requireUser(request: Request, context: ReadContext): Promise<SignedInUser> {
  const identity = await identityOf(context);
  if (!identity) throw unauthorized(request);
  return identity.user;
}

/**
 * The one access check: the caller must be signed in, belong to a team, and hold
 * at least `minimum` role there. Throws a redirect (pages) or 401 JSON (API) for
 * anonymous callers, and 403 when the role is too weak.
 */
export async function requireMember(request: Request, context: ReadContext, minimum: Role = "viewer"): Promise<Member> {
  const identity = await identityOf(context);
  if (!identity) throw unauthorized(request);
  const { team } = identity;
  if (!team) {
    if (isApiRequest(request)) throw forbidden(request, "You are not a member of any team.");
    throw redirect("/teams/new");
  }
  if (!roleAtLeast(team.role, minimum)) {
    throw forbidden(request, `This needs the ${minimum} role or higher; you are ${team.role} in ${team.teamName}.`);
  }
  return { user: identity.user, team, teams: identity.teams, via: identity.via };
}
