import { createReadStream } from "node:fs";
import { readFile } from "node:fs/promises";
import path from "node:path";
import { z } from "zod";
import type { Member, TeamMembership } from "./access";
import { uploadAttachment } from "./attachments";
import { recordAudit } from "./audit";
import { auth } from "./auth";
import { db } from "./db/client";
import { member, organization, user } from "./db/schema";
import { loadDemoSheets, type DemoContent } from "./demo-sheets";
import { createProject } from "./projects";
import { ROLES } from "./roles";
import { addComment, returnRevision, stampRevision, submitForCheck } from "./review";
import { createDocument, saveDocumentVersion } from "./documents";
import { createSheet, saveRevision } from "./sheets";

const demoTeam = z.object({
  team: z.object({ name: z.string(), slug: z.string() }),
  password: z.string().min(10),
  members: z.array(z.object({ email: z.string().email(), name: z.string(), role: z.enum(ROLES) })).min(1),
});
export type DemoTeam = z.infer<typeof demoTeam>;

export async function loadDemoTeam(contentDir = path.resolve("content")): Promise<DemoTeam> {
  return demoTeam.parse(JSON.parse(await readFile(path.join(contentDir, "demo-team.json"), "utf8")));
}

export interface SeededSheets {
  projects: number;
  sheets: number;
  revisions: number;
  documents: number;
}

/**
 * Seeds the invented demo team, then its projects and calc sheets, on an empty
 * database; does nothing when any user exists, so it never touches a real team's data.
 * The sheets are read and checked before anything is written, so bad demo content
 * stops the seed with nothing created.
 */
export async function seedDemo(): Promise<{ seeded: boolean; demo: DemoTeam; content?: SeededSheets }> {
  const demo = await loadDemoTeam();
  const anyone = await db().select({ id: user.id }).from(user).limit(1);
  if (anyone.length > 0) return { seeded: false, demo };
  const content = await loadDemoSheets(demo);

  const userIds: Record<string, string> = {};
  // Demo accounts are made verified through better-auth's own adapter (sign-up would mail each a confirmation link).
  const authContext = await auth().$context;
  const passwordHash = await authContext.password.hash(demo.password);
  for (const person of demo.members) {
    const created = await authContext.internalAdapter.createUser({ email: person.email, name: person.name, emailVerified: true }, { method: "email-password" });
    await authContext.internalAdapter.linkAccount({ userId: created.id, providerId: "credential", accountId: created.id, password: passwordHash });
    userIds[person.email] = created.id;
  }
  const [team] = await db().insert(organization).values({ id: crypto.randomUUID(), name: demo.team.name, slug: demo.team.slug, createdAt: new Date() }).returning();
  for (const person of demo.members) {
    await db().insert(member).values({ id: crypto.randomUUID(), organizationId: team!.id, userId: userIds[person.email]!, role: person.role, createdAt: new Date() });
  }
  await recordAudit({ teamId: team!.id, actorId: null, action: "team.seeded", subjectType: "team", subjectId: team!.id, detail: { name: team!.name } });

  const membership: Omit<TeamMembership, "role"> = { teamId: team!.id, teamName: team!.name, teamSlug: team!.slug };
  const asMember = (email: string): Member => {
    const person = demo.members.find((m) => m.email === email)!;
    const team = { ...membership, role: person.role };
    // The seed acts as each demo member would through the app; "session" is the closest kind of caller.
    return { user: { id: userIds[email]!, name: person.name, email }, team, teams: [team], via: "session" };
  };
  const seeded = await seedDemoSheets(content, asMember, demo.members.find((m) => m.role === "admin")!.email);
  return { seeded: true, demo, content: seeded };
}

/**
 * Creates the demo projects (as the admin) and sheets (as each sheet's author)
 * through the same server functions the pages use, so every revision is checked,
 * evaluated, hashed and audited as a real save is. Stops at the first failure with
 * a message naming the file: the demo is then incomplete and the database must be
 * dropped and seeded again.
 */
async function seedDemoSheets(content: DemoContent, asMember: (email: string) => Member, adminEmail: string): Promise<SeededSheets> {
  const stop = (what: string, reason: string): never => {
    throw new Error(`[seed] stopped at ${what}: ${reason}
The demo team and what came before were created, the rest was not: drop the database and seed again.`);
  };
  const projectIds = new Map<string, string>();
  for (const input of content.projects) {
    try {
      const created = await createProject(asMember(adminEmail), input);
      projectIds.set(created.code, created.id);
    } catch (error) {
      stop(`project ${input.code}`, error instanceof Error ? error.message : String(error));
    }
  }
  let revisions = 0;
  for (const entry of content.sheets) {
    const author = asMember(entry.author);
    const projectId = entry.projectCode === null ? null : projectIds.get(entry.projectCode)!;
    let sheet: { id: string; latestRevisionId: string | null };
    try {
      sheet = await createSheet(author, { title: entry.title, projectId, tags: entry.tags });
    } catch (error) {
      return stop(`sheet "${entry.title}"`, error instanceof Error ? error.message : String(error));
    }
    for (const file of entry.attachments) {
      await uploadAttachment(author, { id: sheet.id, teamId: author.team.teamId }, { fileName: path.basename(file), body: createReadStream(path.resolve("content", file)) }).catch(
        (error: unknown) => stop(file, error instanceof Error ? error.message : String(error)),
      );
    }
    for (const revision of entry.revisions) {
      const saved = await saveRevision(author, sheet, { source: revision.source, baseRevisionId: sheet.latestRevisionId, note: revision.note }).catch((error: unknown) =>
        stop(revision.file, error instanceof Error ? error.message : String(error)),
      );
      if (!saved.ok) {
        stop(revision.file, saved.reason === "invalid" ? saved.problems.map((p) => `line ${p.line}, column ${p.column}: ${p.message}`).join("; ") : saved.message);
      } else {
        sheet = { id: sheet.id, latestRevisionId: saved.revisionId };
        revisions++;
        if (revision.review) {
          const { checker, outcome, comments } = revision.review;
          const reviewer = asMember(checker);
          await submitForCheck(author, saved.revisionId, reviewer.user.id);
          for (const comment of comments) await addComment(reviewer, saved.revisionId, comment);
          if (outcome === "returned") await returnRevision(reviewer, saved.revisionId);
          if (outcome === "verified") await stampRevision(reviewer, saved.revisionId);
        }
      }
    }
  }
  for (const entry of content.documents) {
    const author = asMember(entry.author);
    try {
      const document = await createDocument(author, { title: entry.title, projectId: projectIds.get(entry.projectCode)! });
      const saved = await saveDocumentVersion(author, document, { source: entry.source, baseVersionId: null, note: entry.note });
      if (!saved.ok) stop(entry.file, saved.reason === "invalid" ? saved.problems.map((p) => `line ${p.line}, column ${p.column}: ${p.message}`).join("; ") : saved.message);
    } catch (error) {
      stop(entry.file, error instanceof Error ? error.message : String(error));
    }
  }
  return { projects: content.projects.length, sheets: content.sheets.length, revisions, documents: content.documents.length };
}
