import "server-only";
import { AsyncLocalStorage } from "node:async_hooks";
import type { TokenCeiling } from "@/db/schema";

/**
 * What a request authenticated by a personal API token may reach: its projects and its role ceiling.
 * The route helper runs the handler inside this scope, and authorize()/getRole() read it, so every route
 * keeps the one permission table and a token can never do more than its owner.
 */
export type TokenScope = { tokenId: string; projectIds: readonly string[]; ceiling: TokenCeiling };

const storage = new AsyncLocalStorage<TokenScope>();

export function runWithTokenScope<T>(scope: TokenScope, work: () => Promise<T>): Promise<T> {
  return storage.run(scope, work);
}

/** The token scope of the current request, or null for a browser session. */
export function currentTokenScope(): TokenScope | null {
  return storage.getStore() ?? null;
}
