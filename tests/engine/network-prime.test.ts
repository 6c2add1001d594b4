// The priming system that gives the join kernels their type feedback before a process's first solve
// (engine/network/prime.ts) must exercise every kind of step, or the first real solve still deoptimises.
import { describe, expect, it } from "vitest";
import { planFor, solveDense, solveSystem } from "@/engine/network";
import { primingSystem } from "@/engine/network/prime";
import { maxDiff } from "./network-helpers";

describe("primingSystem()", () => {
  it("has a join through one link, a join through several, a closing step and a Z0 step leaf", () => {
    const plan = planFor(primingSystem());
    const joins = plan.steps.filter((s) => s.kind === "join");
    expect(joins.some((s) => s.kind === "join" && s.aLink.length === 1)).toBe(true);
    expect(joins.some((s) => s.kind === "join" && s.aLink.length > 1)).toBe(true);
    expect(plan.steps.some((s) => s.kind === "close")).toBe(true);
    expect(plan.leaves.some((l) => l.block < 0)).toBe(true);
  });

  it("solves to the dense connection-matrix result (the engine's independent reference solver)", () => {
    const sys = primingSystem();
    expect(maxDiff(solveSystem(sys).s.data, solveDense(sys).s.data)).toBeLessThan(1e-14);
  });
});
