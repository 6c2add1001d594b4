import { describe, expect, it } from "vitest";
import { rankHelmItem } from "@/components/helm/rank";

// The helm lists commands best first by this score (cmdk sorts by the filter's value, common practice
// for command palettes: an exact name first, then prefixes, then fuzzy matches). Issue 18: typing
// "isolation" must put the isolation check above the leak trace, which has "isolation" as a keyword.
const isolation = { value: "check.isolation", keywords: ["Run isolation check", "isolation", "leakage", "rule"] };
const leak = { value: "check.leak_trace", keywords: ["Trace leak paths", "leak", "path", "coupling", "isolation"] };
const match = { value: "check.match", keywords: ["Run match check", "return loss", "vswr"] };

const rank = (item: { value: string; keywords: string[] }, typed: string) => rankHelmItem(item.value, typed, item.keywords);

describe("rankHelmItem", () => {
  it("ranks the command whose name is exactly what was typed first", () => {
    expect(rank(isolation, "isolation")).toBeGreaterThan(rank(leak, "isolation"));
    expect(rank(isolation, "  Isolation ")).toBe(1);
    expect(rank(match, "match")).toBeGreaterThan(rank(isolation, "match"));
  });

  it("puts a title prefix above a keyword-only match, and hides items that do not match at all", () => {
    expect(rank(leak, "trace")).toBeGreaterThan(rank(isolation, "trace"));
    expect(rank(leak, "coupling")).toBeGreaterThan(0);
    expect(rank(isolation, "coupling")).toBe(0);
  });

  it("scores every item alike when nothing is typed", () => {
    expect(rank(isolation, "")).toBe(rank(leak, ""));
  });
});
