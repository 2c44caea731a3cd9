import { and, asc, desc, eq, gt, sql } from "drizzle-orm";
import { recordAudit } from "./audit";
import { auth } from "./auth";
import { db } from "./db/client";
import { auditEvent, invitation, member, organization, user } from "./db/schema";
import type { Member } from "./access";
import type { Role } from "./roles";

/** A refusal the user can act on; routes show its message as a form error. */
export class TeamRuleError extends Error {}

export async function listMembers(teamId: string) {
  return db()
    .select({ memberId: member.id, userId: user.id, name: user.name, email: user.email, role: member.role, joinedAt: member.createdAt })
    .from(member)
    .innerJoin(user, eq(member.userId, user.id))
    .where(eq(member.organizationId, teamId))
    .orderBy(asc(user.name));
}

export async function listPendingInvitations(teamId: string) {
  return db()
    .select({ id: invitation.id, email: invitation.email, role: invitation.role, expiresAt: invitation.expiresAt })
    .from(invitation)
    .where(and(eq(invitation.organizationId, teamId), eq(invitation.status, "pending"), gt(invitation.expiresAt, new Date())))
    .orderBy(desc(invitation.expiresAt));
}

/**
 * Runs `change` with the team's member rows locked, and refuses it if it would
 * leave the team without an admin. Locking makes two concurrent demotions take turns.
 */
async function withAdminGuard(teamId: string, memberId: string, change: (tx: Parameters<Parameters<ReturnType<typeof db>["transaction"]>[0]>[0], target: { userId: string; role: string }) => Promise<{ roleAfter: string | null }>) {
  return db().transaction(async (tx) => {
    const rows = await tx
      .select({ id: member.id, userId: member.userId, role: member.role })
      .from(member)
      .where(eq(member.organizationId, teamId))
      .for("update");
    const target = rows.find((r) => r.id === memberId);
    if (!target) throw new TeamRuleError("That person is not a member of this team.");
    const { roleAfter } = await change(tx, target);
    const adminsAfter = rows.filter((r) => (r.id === memberId ? roleAfter === "admin" : r.role === "admin")).length;
    if (adminsAfter === 0) throw new TeamRuleError("A team needs at least one admin: make someone else admin first.");
    return target;
  });
}

export async function changeRole(actor: Member, memberId: string, role: Role): Promise<void> {
  await withAdminGuard(actor.team.teamId, memberId, async (tx, target) => {
    await tx.update(member).set({ role }).where(eq(member.id, memberId));
    await recordAudit(
      { teamId: actor.team.teamId, actorId: actor.user.id, action: "member.role-changed", subjectType: "member", subjectId: target.userId, detail: { from: target.role, to: role } },
      tx,
    );
    return { roleAfter: role };
  });
}

export async function removeMember(actor: Member, memberId: string): Promise<void> {
  await withAdminGuard(actor.team.teamId, memberId, async (tx, target) => {
    await tx.delete(member).where(eq(member.id, memberId));
    await recordAudit(
      { teamId: actor.team.teamId, actorId: actor.user.id, action: "member.removed", subjectType: "member", subjectId: target.userId, detail: { role: target.role } },
      tx,
    );
    return { roleAfter: null };
  });
}

/** Sends an invitation e-mail through better-auth (which checks the inviter's admin role too). */
export async function inviteMember(actor: Member, request: Request, email: string, role: Role): Promise<void> {
  const existing = await db()
    .select({ id: member.id })
    .from(member)
    .innerJoin(user, eq(member.userId, user.id))
    .where(and(eq(member.organizationId, actor.team.teamId), sql`lower(${user.email}) = lower(${email})`))
    .limit(1);
  if (existing.length > 0) throw new TeamRuleError(`${email} is already a member of this team.`);
  try {
    await auth().api.createInvitation({ headers: request.headers, body: { email, role, organizationId: actor.team.teamId, resend: true } });
  } catch (error) {
    throw new TeamRuleError(`The invitation could not be sent: ${(error as Error).message}`);
  }
  await recordAudit({ teamId: actor.team.teamId, actorId: actor.user.id, action: "member.invited", subjectType: "invitation", subjectId: email, detail: { role } });
}

export async function cancelInvitation(actor: Member, invitationId: string): Promise<void> {
  const rows = await db()
    .update(invitation)
    .set({ status: "canceled" })
    .where(and(eq(invitation.id, invitationId), eq(invitation.organizationId, actor.team.teamId), eq(invitation.status, "pending")))
    .returning({ email: invitation.email });
  if (rows.length === 0) throw new TeamRuleError("That invitation is no longer pending.");
  await recordAudit({ teamId: actor.team.teamId, actorId: actor.user.id, action: "invitation.canceled", subjectType: "invitation", subjectId: invitationId, detail: { email: rows[0]!.email } });
}

export async function getInvitation(invitationId: string) {
  const [row] = await db()
    .select({ id: invitation.id, email: invitation.email, role: invitation.role, status: invitation.status, expiresAt: invitation.expiresAt, teamName: organization.name, teamId: organization.id })
    .from(invitation)
    .innerJoin(organization, eq(invitation.organizationId, organization.id))
    .where(eq(invitation.id, invitationId))
    .limit(1);
  return row;
}

export async function teamAudit(teamId: string, limit = 100) {
  return db()
    .select({ id: auditEvent.id, action: auditEvent.action, subjectType: auditEvent.subjectType, subjectId: auditEvent.subjectId, detail: auditEvent.detail, createdAt: auditEvent.createdAt, actorName: user.name })
    .from(auditEvent)
    .leftJoin(user, eq(auditEvent.actorId, user.id))
    .where(eq(auditEvent.teamId, teamId))
    .orderBy(desc(auditEvent.createdAt))
    .limit(limit);
}

export function slugify(name: string): string {
  const base = name.toLowerCase().normalize("NFKD").replace(/[^a-z0-9]+/g, "-").replace(/^-+|-+$/g, "").slice(0, 40) || "team";
  return `${base}-${crypto.randomUUID().slice(0, 6)}`;
}
