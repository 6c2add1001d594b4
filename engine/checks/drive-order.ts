// The order of drive-check rows that the workspace and the bundle's report share (issue 15 item 5).
import type { Verdict } from "./types";

type DriveRow = { block: string; verdict: Verdict | null; margin: number | null; worstDbm: number };

const VERDICT_RANK: Record<Verdict, number> = { fail: 0, warn: 1, pass: 2 };

/**
 * Drive rows in the order a reviewer wants them: failures, then warnings, then passes, each by smallest
 * margin first; blocks with no rating last, hottest first. (Sorting on margin alone put the unrated
 * blocks, whose margin is empty, at the top.)
 *
 * @example orderDriveRows(driveCheck(sol, opts).blocks)[0].verdict // "fail" when any block fails
 */
export function orderDriveRows<T extends DriveRow>(rows: readonly T[]): T[] {
  return [...rows].sort((a, b) => {
    if (a.verdict === null || b.verdict === null) {
      if (a.verdict !== b.verdict) return a.verdict === null ? 1 : -1;
      return b.worstDbm - a.worstDbm || a.block.localeCompare(b.block);
    }
    return VERDICT_RANK[a.verdict] - VERDICT_RANK[b.verdict] || (a.margin ?? 0) - (b.margin ?? 0) || a.block.localeCompare(b.block);
  });
}
