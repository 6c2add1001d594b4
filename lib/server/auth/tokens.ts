import "server-only";
import { createHash, randomBytes } from "node:crypto";

/** A fresh random token for links and cookies (32 bytes, base64url). */
export function generateToken(): string {
  return randomBytes(32).toString("base64url");
}

/** What the database stores in place of a token: its SHA-256, hex-encoded. */
export function hashToken(token: string): string {
  return createHash("sha256").update(token).digest("hex");
}
