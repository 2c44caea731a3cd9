import { and, asc, eq, isNull } from "drizzle-orm";
import { redirect } from "react-router";
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

export async function membershipsOf(userId: string): Promise<TeamMembership[]> {
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

async function fromApiKey(request: Request): Promise<{ user: SignedInUser; teamId: string } | null> {
  const header = request.headers.get("authorization");
  if (!header?.toLowerCase().startsWith("bearer ")) return null;
  const secret = header.slice(7).trim();
  if (!secret) return null;
  const [row] = await db()
    .select({ keyId: apiKey.id, teamId: apiKey.teamId, lastUsedAt: apiKey.lastUsedAt, id: user.id, name: user.name, email: user.email })
    .from(apiKey)
    .innerJoin(user, eq(apiKey.userId, user.id))
    .where(and(eq(apiKey.secretHash, hashApiKey(secret)), isNull(apiKey.revokedAt)))
    .limit(1);
  if (!row) return null;
  if (!row.lastUsedAt || Date.now() - row.lastUsedAt.getTime() > LAST_USED_RESOLUTION_MS) {
    await db().update(apiKey).set({ lastUsedAt: new Date() }).where(eq(apiKey.id, row.keyId));
  }
  return { user: { id: row.id, name: row.name, email: row.email }, teamId: row.teamId };
}

type SignedIn = { user: SignedInUser; activeTeamId: string | null; via: Member["via"] };

/**
 * The layout's loader and the page's loader both ask who is signing in; one lookup
 * per request serves both. Keyed by the request object, so it lives exactly as long
 * as the request.
 */
const signedInByRequest = new WeakMap<Request, Promise<SignedIn | null>>();

/** The signed-in user and their session's active team, or null. Never throws for anonymous requests. */
export function getSignedIn(request: Request): Promise<SignedIn | null> {
  let lookup = signedInByRequest.get(request);
  if (!lookup) {
    lookup = lookUpSignedIn(request);
    signedInByRequest.set(request, lookup);
    lookup.catch(() => signedInByRequest.delete(request));
  }
  return lookup;
}

async function lookUpSignedIn(request: Request): Promise<SignedIn | null> {
  if (isApiRequest(request)) {
    const keyed = await fromApiKey(request);
    if (keyed) {
      noteSignedIn(keyed.user.id, "api-key");
      return { user: keyed.user, activeTeamId: keyed.teamId, via: "api-key" };
    }
  }
  const session = await auth().api.getSession({ headers: request.headers });
  if (!session) return null;
  const { id, name, email } = session.user;
  noteSignedIn(id, "session");
  return { user: { id, name, email }, activeTeamId: session.session.activeOrganizationId ?? null, via: "session" };
}

export async function requireUser(request: Request): Promise<SignedInUser> {
  const signedIn = await getSignedIn(request);
  if (!signedIn) throw unauthorized(request);
  return signedIn.user;
}

/**
 * The one access check: the caller must be signed in, belong to a team, and hold
 * at least `minimum` role there. Throws a redirect (pages) or 401 JSON (API) for
 * anonymous callers, and 403 when the role is too weak.
 */
export async function requireMember(request: Request, minimum: Role = "viewer"): Promise<Member> {
  const signedIn = await getSignedIn(request);
  if (!signedIn) throw unauthorized(request);
  const teams = await membershipsOf(signedIn.user.id);
  const team = teams.find((t) => t.teamId === signedIn.activeTeamId) ?? (signedIn.via === "session" ? teams[0] : undefined);
  if (!team) {
    if (isApiRequest(request)) throw forbidden(request, "You are not a member of any team.");
    throw redirect("/teams/new");
  }
  if (!roleAtLeast(team.role, minimum)) {
    throw forbidden(request, `This needs the ${minimum} role or higher; you are ${team.role} in ${team.teamName}.`);
  }
  return { user: signedIn.user, team, teams, via: signedIn.via };
}
