import { eq } from "drizzle-orm";
import { readFile } from "node:fs/promises";
import path from "node:path";
import { z } from "zod";
import { recordAudit } from "./audit";
import { auth } from "./auth";
import { db } from "./db/client";
import { member, organization, user } from "./db/schema";
import { ROLES } from "./roles";

const demoTeam = z.object({
  team: z.object({ name: z.string(), slug: z.string() }),
  password: z.string().min(10),
  members: z.array(z.object({ email: z.string().email(), name: z.string(), role: z.enum(ROLES) })).min(1),
});
export type DemoTeam = z.infer<typeof demoTeam>;

export async function loadDemoTeam(contentDir = path.resolve("content")): Promise<DemoTeam> {
  return demoTeam.parse(JSON.parse(await readFile(path.join(contentDir, "demo-team.json"), "utf8")));
}

/**
 * Seeds the invented demo team on an empty database; does nothing when any user
 * exists, so it never touches a real team's data.
 */
export async function seedDemo(): Promise<{ seeded: boolean; demo: DemoTeam }> {
  const demo = await loadDemoTeam();
  const anyone = await db().select({ id: user.id }).from(user).limit(1);
  if (anyone.length > 0) return { seeded: false, demo };

  const userIds: Record<string, string> = {};
  for (const person of demo.members) {
    const created = await auth().api.signUpEmail({ body: { email: person.email, password: demo.password, name: person.name } });
    userIds[person.email] = created.user.id;
    await db().update(user).set({ emailVerified: true }).where(eq(user.id, created.user.id));
  }
  const [team] = await db().insert(organization).values({ id: crypto.randomUUID(), name: demo.team.name, slug: demo.team.slug, createdAt: new Date() }).returning();
  for (const person of demo.members) {
    await db().insert(member).values({ id: crypto.randomUUID(), organizationId: team!.id, userId: userIds[person.email]!, role: person.role, createdAt: new Date() });
  }
  await recordAudit({ teamId: team!.id, actorId: null, action: "team.seeded", subjectType: "team", subjectId: team!.id, detail: { name: team!.name } });
  return { seeded: true, demo };
}
