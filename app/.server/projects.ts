import { and, asc, count, eq } from "drizzle-orm";
import type { z } from "zod";
import type { projectForm } from "~/lib/forms/sheets";
import { recordAudit } from "./audit";
import { db } from "./db/client";
import { calcSheet, project } from "./db/schema";
import type { Member } from "./access";

export class ProjectRuleError extends Error {
  constructor(
    message: string,
    readonly field?: string,
  ) {
    super(message);
  }
}

type ProjectInput = z.infer<typeof projectForm>;

export async function listProjects(teamId: string) {
  return db()
    .select({ id: project.id, code: project.code, name: project.name, client: project.client, description: project.description, updatedAt: project.updatedAt, sheets: count(calcSheet.id) })
    .from(project)
    .leftJoin(calcSheet, eq(calcSheet.projectId, project.id))
    .where(eq(project.teamId, teamId))
    .groupBy(project.id)
    .orderBy(asc(project.code));
}

export async function getProjectByCode(teamId: string, code: string) {
  const [row] = await db()
    .select()
    .from(project)
    .where(and(eq(project.teamId, teamId), eq(project.code, code.toUpperCase())))
    .limit(1);
  return row;
}

export async function getProjectById(teamId: string, id: string) {
  const [row] = await db()
    .select()
    .from(project)
    .where(and(eq(project.teamId, teamId), eq(project.id, id)))
    .limit(1);
  return row;
}

function isUniqueViolation(error: unknown): boolean {
  const e = error as { code?: string; cause?: { code?: string } };
  return e?.code === "23505" || e?.cause?.code === "23505";
}

export async function createProject(me: Member, input: ProjectInput) {
  try {
    const [row] = await db()
      .insert(project)
      .values({ ...input, teamId: me.team.teamId, createdBy: me.user.id })
      .returning();
    await recordAudit({ teamId: me.team.teamId, actorId: me.user.id, action: "project.created", subjectType: "project", subjectId: row!.id, detail: { code: row!.code } });
    return row!;
  } catch (error) {
    if (isUniqueViolation(error)) throw new ProjectRuleError(`The code ${input.code} is already used by another project in this team.`, "code");
    throw error;
  }
}

export async function updateProject(me: Member, projectId: string, input: ProjectInput) {
  try {
    const [row] = await db()
      .update(project)
      .set({ ...input, updatedAt: new Date() })
      .where(and(eq(project.id, projectId), eq(project.teamId, me.team.teamId)))
      .returning();
    if (!row) throw new ProjectRuleError("That project does not exist in this team.");
    await recordAudit({ teamId: me.team.teamId, actorId: me.user.id, action: "project.updated", subjectType: "project", subjectId: row.id, detail: { code: row.code } });
    return row;
  } catch (error) {
    if (isUniqueViolation(error)) throw new ProjectRuleError(`The code ${input.code} is already used by another project in this team.`, "code");
    throw error;
  }
}
