import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { addEdge, createGraph, kShortestPaths, type WeightedGraph } from "@/engine/checks/k-shortest-paths";

/** Every simple path s → t by exhaustive search (the definition the ranking must match). */
function allSimplePaths(g: WeightedGraph, s: number, t: number): number[] {
  const costs: number[] = [];
  const on = new Uint8Array(g.n);
  const walk = (u: number, cost: number) => {
    if (u === t) { costs.push(cost); return; }
    on[u] = 1;
    const { to, w } = g.adj[u];
    for (let i = 0; i < to.length; i++) if (!on[to[i]]) walk(to[i], cost + w[i]);
    on[u] = 0;
  };
  walk(s, 0);
  return costs.sort((a, b) => a - b);
}

describe("kShortestPaths()", () => {
  it("ranks the worked example of Yen's algorithm: C→H costs 5, 7, 8", () => {
    // Example graph used to illustrate Yen's algorithm (from memory): nodes C D E F G H;
    // C→D 3, C→E 2, D→F 4, E→D 1, E→F 2, E→G 3, F→G 2, F→H 1, G→H 2. Shortest: C-E-F-H (5), then
    // C-E-G-H (7), then a path of cost 8 (C-D-F-H or C-E-D-F-H).
    const [C, D, E, F, G, H] = [0, 1, 2, 3, 4, 5];
    const g = createGraph(6);
    for (const [u, v, w] of [[C, D, 3], [C, E, 2], [D, F, 4], [E, D, 1], [E, F, 2], [E, G, 3], [F, G, 2], [F, H, 1], [G, H, 2]]) addEdge(g, u, v, w);
    const r = kShortestPaths(g, C, H, 3);
    expect(r.paths.map((p) => p.cost)).toEqual([5, 7, 8]);
    expect(r.paths[0].nodes).toEqual([C, E, F, H]);
    expect(r.paths[1].nodes).toEqual([C, E, G, H]);
    expect([[C, D, F, H].join(), [C, E, D, F, H].join()]).toContain(r.paths[2].nodes.join());
    expect(r.ranking).toBe("exact");
  });

  it("matches exhaustive enumeration on random graphs, negative weights included (property)", () => {
    // Negative weights come from gains above one; Johnson potentials keep the ranking exact as long as
    // no cycle has negative total weight: forward edges (u < v) weigh ≥ −3 and backward edges ≥ 3n, so every cycle is positive.
    const arb = fc.record({
      n: fc.integer({ min: 3, max: 7 }),
      edges: fc.array(fc.tuple(fc.nat(6), fc.nat(6), fc.integer({ min: -3, max: 10 })), { maxLength: 30 }),
      K: fc.integer({ min: 1, max: 8 }),
    });
    fc.assert(
      fc.property(arb, ({ n, edges, K }) => {
        const g = createGraph(n);
        const seen = new Set<string>();
        for (const [a, b, w] of edges) {
          const u = a % n, v = b % n;
          if (u === v || seen.has(`${u},${v}`)) continue;
          seen.add(`${u},${v}`);
          // forward edges may be negative; backward edges carry enough weight that no cycle is negative
          addEdge(g, u, v, u < v ? w : Math.abs(w) + 3 * n);
        }
        const brute = allSimplePaths(g, 0, n - 1).slice(0, K);
        const r = kShortestPaths(g, 0, n - 1, K);
        expect(r.ranking).toBe("exact");
        expect(r.paths.map((p) => p.cost)).toEqual(brute);
        for (const p of r.paths) expect(new Set(p.nodes).size).toBe(p.nodes.length);
      }),
      { numRuns: 400 },
    );
  });

  it("a loop with net gain makes the ranking approximate but still returns simple paths sorted by true cost", () => {
    const g = createGraph(4);
    addEdge(g, 0, 1, 1);
    addEdge(g, 1, 2, -5);
    addEdge(g, 2, 1, 2); // cycle 1→2→1 totals −3
    addEdge(g, 2, 3, 1);
    addEdge(g, 0, 3, 0);
    const r = kShortestPaths(g, 0, 3, 5);
    expect(r.ranking).toBe("approximate");
    expect(r.paths.map((p) => p.cost)).toEqual([-3, 0]);
    expect(r.messages[0]).toMatch(/loop with net gain/);
  });
});
