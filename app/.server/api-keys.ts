import { createHash, randomBytes } from "node:crypto";
import { and, desc, eq, isNull } from "drizzle-orm";
import { db } from "./db/client";
import { apiKey } from "./db/schema";

const KEY_PREFIX = "swk_";

export function hashApiKey(secret: string): string {
  return createHash("sha256").update(secret).digest("hex");
}

/** Makes a key for the member in their current team; the secret is returned once and only its hash is kept. */
export async function createApiKey(userId: string, teamId: string, name: string): Promise<{ id: string; secret: string }> {
  const secret = KEY_PREFIX + randomBytes(24).toString("base64url");
  const [row] = await db()
    .insert(apiKey)
    .values({ userId, teamId, name, prefix: secret.slice(0, KEY_PREFIX.length + 6), secretHash: hashApiKey(secret) })
    .returning({ id: apiKey.id });
  return { id: row!.id, secret };
}

export async function listApiKeys(userId: string, teamId: string) {
  return db()
    .select({ id: apiKey.id, name: apiKey.name, prefix: apiKey.prefix, createdAt: apiKey.createdAt, lastUsedAt: apiKey.lastUsedAt })
    .from(apiKey)
    .where(and(eq(apiKey.userId, userId), eq(apiKey.teamId, teamId), isNull(apiKey.revokedAt)))
    .orderBy(desc(apiKey.createdAt));
}

/** Revokes one of the member's own keys; returns false when it is not theirs or already revoked. */
export async function revokeApiKey(userId: string, keyId: string): Promise<boolean> {
  const rows = await db()
    .update(apiKey)
    .set({ revokedAt: new Date() })
    .where(and(eq(apiKey.id, keyId), eq(apiKey.userId, userId), isNull(apiKey.revokedAt)))
    .returning({ id: apiKey.id });
  return rows.length > 0;
}
