import { describe, expect, it } from "vitest";
import { solveSystem } from "@/engine/network";
import { powerLedger } from "@/engine/checks/power-ledger";
import { describeBalance, enteringFraction, ledgerShares } from "@/lib/domain/checks/ledger-shares";
import { orderDriveRows } from "@/lib/domain/checks/drive-order";
import type { RuleSpec } from "@/engine/types";
import { rulePair } from "@/components/helm/commands";
import { buildSystem, c, twoPort } from "../engine/checks-helpers";

const f1 = [1e9];

function ledgerOf(s11: number, s21: number, s12: number, s22: number) {
  const sys = buildSystem({ frequencies: f1, blocks: [{ id: "DUT", s: twoPort(c(s11), c(s12), c(s21), c(s22)) }], links: [], ports: [{ name: "A", at: "DUT:1" }, { name: "B", at: "DUT:2" }] });
  return powerLedger(solveSystem(sys), "A");
}

describe("ledgerShares()", () => {
  it("gives each share against the power that entered the port, not against 1 W incident", () => {
    // Lossy two-port S11 = S22 = 0.5, S21 = S12 = 0.5 driven at port 1 with port 2 matched: reflected
    // |S11|² = 0.25, entering 1 − 0.25 = 0.75 W, out |S21|² = 0.25 W = 1/3 of the entering power
    // (−4.771 dB), absorbed 0.5 W = 2/3 (−1.761 dB). Power balance per Pozar, Microwave Engineering 4th ed. §4.3.
    const r = ledgerOf(0.5, 0.5, 0.5, 0.5);
    expect(enteringFraction(r, 0)).toBeCloseTo(0.75, 12);
    const rows = ledgerShares(r, 0);
    expect(rows[0].role).toBe("reflected");
    expect(rows[0].ofEntering).toBeNull();
    expect(rows[0].db).toBeCloseTo(10 * Math.log10(0.25), 9);
    const out = rows.find((x) => x.role === "output")!;
    expect(out.ofEntering).toBeCloseTo(1 / 3, 12);
    expect(out.db).toBeCloseTo(-4.7712, 4);
    const absorbed = rows.find((x) => x.role === "absorbed")!;
    expect(absorbed.ofEntering).toBeCloseTo(2 / 3, 12);
    expect(absorbed.db).toBeCloseTo(-1.7609, 4);
    // shares after the reflection add up to the entering power (energy conservation, same source)
    expect(rows.slice(1).reduce((s, x) => s + (x.ofEntering ?? 0), 0)).toBeCloseTo(1, 12);
    expect(describeBalance(r, 0)).toMatch(/^1 W incident at A = 0\.250 W reflected \+ 0\.250 W out of the other system ports \+ 0\.500 W absorbed .*the books balance/);
  });

  it("shows an amplifier's output as gain in dB and names the added power", () => {
    // Matched unilateral amplifier |S21| = 10 (20 dB): 100 W out per watt entering (+20 dB), the block adds
    // 99 W (power balance with a source inside the block; common practice).
    const r = ledgerOf(0, 10, 0, 0);
    const rows = ledgerShares(r, 0);
    const out = rows.find((x) => x.role === "output")!;
    expect(out.ofEntering).toBeCloseTo(100, 9);
    expect(out.db).toBeCloseTo(20, 9);
    const added = rows.find((x) => x.role === "added")!;
    expect(added.ofIncident).toBeCloseTo(-99, 9);
    expect(describeBalance(r, 0)).toContain("− 99.0 W added by active blocks");
  });
});

describe("orderDriveRows()", () => {
  it("puts failures and the closest margins first and unrated blocks last", () => {
    // Review order (common practice for a rating table): fail < warn < pass, then smallest margin; no rating last.
    const rows = [
      { block: "LNA", verdict: null, margin: null, worstDbm: 25 },
      { block: "SW", verdict: "pass" as const, margin: 12, worstDbm: 20 },
      { block: "FIL", verdict: "pass" as const, margin: 3, worstDbm: 27 },
      { block: "PA", verdict: "fail" as const, margin: -2, worstDbm: 32 },
      { block: "CPL", verdict: "warn" as const, margin: 0.5, worstDbm: 29 },
      { block: "ANT", verdict: null, margin: null, worstDbm: 30 },
    ];
    expect(orderDriveRows(rows).map((r) => r.block)).toEqual(["PA", "CPL", "FIL", "SW", "ANT", "LNA"]);
  });
});

describe("rulePair()", () => {
  it("takes the insertion loss pair from a rule or the line-up path, not TX→RX", () => {
    const ports = ["TX", "RX", "ANT"];
    const rules = [
      { kind: "isolation", id: "iso", from: "TX", to: "RX", min_db: 30 },
      { kind: "gain", id: "g", from: "ANT", to: "RX", min_db: 10 },
    ] as unknown as RuleSpec[];
    expect(rulePair(rules, ports, ["insertion_loss", "gain", "noise_figure"])).toEqual(["ANT", "RX"]);
    const withIl = [...rules, { kind: "insertion_loss", id: "il", from: "TX", to: "ANT", max_db: 1 }] as unknown as RuleSpec[];
    expect(rulePair(withIl, ports, ["insertion_loss", "gain", "noise_figure"])).toEqual(["TX", "ANT"]);
    // a rule naming a port this scenario lacks is no default
    expect(rulePair([{ kind: "insertion_loss", id: "x", from: "TX", to: "LO", max_db: 1 }] as unknown as RuleSpec[], ports, ["insertion_loss"])).toBeNull();
  });
});
