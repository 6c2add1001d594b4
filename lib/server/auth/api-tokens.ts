import "server-only";
import { randomUUID } from "node:crypto";
import { and, desc, eq, inArray } from "drizzle-orm";
import { db, runInTransaction } from "@/db/client";
import { apiTokens, memberships, projects, users, type TokenCeiling } from "@/db/schema";
import { AppError } from "@/lib/base/errors";
import type { CreateApiTokenInput } from "@/lib/base/validation/api-tokens";
import { recordAudit } from "@/lib/server/audit";
import type { SessionUser } from "./session";
import type { TokenScope } from "./token-scope";
import { generateToken, hashToken } from "./tokens";

/** Tokens start with this, so secret scanners and people can recognise them. */
export const API_TOKEN_PREFIX = "ptl_";
const DAY_MS = 24 * 60 * 60 * 1000;

/** What the Account page and the token API show: never the token or its hash. */
export type ApiTokenView = {
  id: string;
  name: string;
  prefix: string;
  projects: { id: string; name: string }[];
  roleCeiling: TokenCeiling;
  expiresAt: Date;
  lastUsedAt: Date | null;
  revokedAt: Date | null;
  createdAt: Date;
};

/**
 * Create a token for `actor`, limited to projects they are a member of (404 naming none otherwise).
 * Returns the token once; only its SHA-256 is stored (the token carries 256 random bits, so a fast
 * hash is enough: there is nothing to guess).
 */
export async function createApiToken({ actor, input, now = new Date() }: { actor: SessionUser; input: CreateApiTokenInput; now?: Date }): Promise<{ token: string; view: ApiTokenView }> {
  const token = `${API_TOKEN_PREFIX}${generateToken()}`;
  const projectIds = [...new Set(input.projectIds)];
  const id = randomUUID();
  await runInTransaction(async (tx) => {
    const member = await tx
      .select({ projectId: memberships.projectId })
      .from(memberships)
      .where(and(eq(memberships.userId, actor.id), inArray(memberships.projectId, projectIds)));
    if (member.length !== projectIds.length) {
      throw new AppError("validation_failed", 400, "A token can only reach projects you are a member of.", { projectIds: "Choose projects you are a member of." });
    }
    await tx.insert(apiTokens).values({
      id,
      userId: actor.id,
      name: input.name,
      tokenHash: hashToken(token),
      prefix: token.slice(0, API_TOKEN_PREFIX.length + 6),
      projectIds,
      roleCeiling: input.roleCeiling,
      expiresAt: new Date(now.getTime() + input.expiresInDays * DAY_MS),
      createdAt: now,
    });
    await recordAudit(tx, { actor, action: "api_token.create", target: input.name, detail: { tokenId: id, roleCeiling: input.roleCeiling, projectIds } });
  });
  const [view] = await listApiTokens({ userId: actor.id, ids: [id] });
  return { token, view };
}

/** The tokens of one person, newest first (revoked and expired ones included, marked). */
export async function listApiTokens({ userId, ids }: { userId: string; ids?: string[] }): Promise<ApiTokenView[]> {
  const rows = await db
    .select()
    .from(apiTokens)
    .where(ids ? and(eq(apiTokens.userId, userId), inArray(apiTokens.id, ids)) : eq(apiTokens.userId, userId))
    .orderBy(desc(apiTokens.createdAt));
  const allProjectIds = [...new Set(rows.flatMap((row) => row.projectIds))];
  const names = new Map(
    allProjectIds.length === 0
      ? []
      : (await db.select({ id: projects.id, name: projects.name }).from(projects).where(inArray(projects.id, allProjectIds))).map((p) => [p.id, p.name]),
  );
  return rows.map((row) => ({
    id: row.id,
    name: row.name,
    prefix: row.prefix,
    projects: row.projectIds.filter((pid) => names.has(pid)).map((pid) => ({ id: pid, name: names.get(pid)! })),
    roleCeiling: row.roleCeiling,
    expiresAt: row.expiresAt,
    lastUsedAt: row.lastUsedAt,
    revokedAt: row.revokedAt,
    createdAt: row.createdAt,
  }));
}

/** Revoke one of `actor`'s tokens (404 if it is not theirs). Revoking twice is harmless. */
export async function revokeApiToken({ actor, tokenId, now = new Date() }: { actor: SessionUser; tokenId: string; now?: Date }): Promise<void> {
  await runInTransaction(async (tx) => {
    const [row] = await tx.select().from(apiTokens).where(and(eq(apiTokens.id, tokenId), eq(apiTokens.userId, actor.id)));
    if (!row) throw new AppError("not_found", 404, "Token not found.");
    if (row.revokedAt) return;
    await tx.update(apiTokens).set({ revokedAt: now }).where(eq(apiTokens.id, tokenId));
    await recordAudit(tx, { actor, action: "api_token.revoke", target: row.name, detail: { tokenId } });
  });
}

const INVALID_TOKEN = "The API token is not valid: it may be mistyped, expired or revoked.";

/**
 * The person and scope behind an `Authorization: Bearer` token, or 401. Site admin rights never come
 * with a token.
 */
export async function authenticateApiToken(token: string, now = new Date()): Promise<{ user: SessionUser; scope: TokenScope }> {
  if (!token.startsWith(API_TOKEN_PREFIX) || token.length > 200) throw new AppError("unauthenticated", 401, INVALID_TOKEN);
  const [row] = await db
    .select({ token: apiTokens, user: { id: users.id, email: users.email, name: users.name }, deactivatedAt: users.deactivatedAt })
    .from(apiTokens)
    .innerJoin(users, eq(users.id, apiTokens.userId))
    .where(eq(apiTokens.tokenHash, hashToken(token)));
  if (!row || row.deactivatedAt || row.token.revokedAt || row.token.expiresAt.getTime() <= now.getTime()) throw new AppError("unauthenticated", 401, INVALID_TOKEN);
  // Recorded at most once a minute per token, to keep reads from writing on every request.
  if (!row.token.lastUsedAt || now.getTime() - row.token.lastUsedAt.getTime() > 60_000) {
    await db.update(apiTokens).set({ lastUsedAt: now }).where(eq(apiTokens.id, row.token.id));
  }
  return {
    user: { ...row.user, isSiteAdmin: false },
    scope: { tokenId: row.token.id, projectIds: row.token.projectIds, ceiling: row.token.roleCeiling },
  };
}
