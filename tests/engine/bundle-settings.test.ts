// What a bundle says about switch settings (issue 18 item 3): the setting judged, the state sweep summary
// and the drive check tables, checked against closed forms and against the state sweep run on its own.
import { describe, expect, it } from "vitest";
import { checksCsv, computeBundleResults, reproduceBundle, settingText, type ChecksDocument, type OpenedBundle } from "@/engine/bundle";
import { effectiveRuleSet, judgingRules, stateSweep } from "@/engine/checks";
import { executeCheck } from "@/lib/domain/checks/execute";
import { parseScenario } from "@/engine/scenario";
import { sweepHeadline } from "@/lib/server/bundle/report-settings";

// A 3 dB pad into a single-pole double-throw switch (0.5 dB loss, 30 dB isolation, absorptive), every
// part matched. TX drives the pad; throw 1 goes to the system port A, throw 2 to a rated load LB. In
// such a matched chain every incident power is the source power less the losses on the way, in dB
// (dB of a power ratio, 10·log10(P2/P1): IEEE Std 100; dBm relative to 1 mW), so the levels below are
// closed forms: pad port 1: 10 dBm; switch common: 10 − 3 = 7 dBm; LB on the selected throw: 7 − 0.5 =
// 6.5 dBm, on the unselected one: 7 − 30 = −23 dBm. Insertion loss TX → A: 3.5 dB when A is selected,
// 3 + 30 = 33 dB when not.
function padSwitch(state: 1 | 2, rules: unknown[]): Record<string, unknown> {
  return {
    format: "portolan.scenario/1",
    name: "Pad and switch",
    z0: 50,
    frequency: { start: 1e9, stop: 2e9, points: 11 },
    blocks: [
      { id: "PAD", kind: "attenuator", params: { loss_db: 3 }, rating_dbm: 9.8 },
      { id: "SW", kind: "switch", params: { throws: 2, insertion_loss_db: 0.5, isolation_db: 30, off_state: "absorptive" }, state, label: "output switch", rating_dbm: 8 },
      { id: "LB", kind: "load", params: { impedance: [50, 0] }, rating_dbm: 6.2 },
    ],
    links: [
      ["PAD:2", "SW:1"],
      ["SW:3", "LB:1"],
    ],
    ports: [
      { name: "TX", at: "PAD:1" },
      { name: "A", at: "SW:2" },
    ],
    rules,
  };
}

const LOSS = { kind: "insertion_loss", id: "tx-a-loss", from: "TX", to: "A", band: [1e9, 2e9], max_db: 4 };
const DRIVE = { kind: "drive", id: "tx-drive", sources: [{ port: "TX", dbm: 10 }] };

describe("switch settings in a bundle", () => {
  it("checks.json names every switch with the throw its verdicts were judged in, and checks.csv says it on every row", () => {
    for (const state of [1, 2] as const) {
      const { checks } = computeBundleResults(padSwitch(state, [LOSS]), {});
      expect(checks.switch_states).toEqual([{ block: "SW", label: "output switch", throws: 2, state }]);
      const csv = checksCsv(checks).trimEnd().split("\r\n");
      expect(csv[0].endsWith(",switch_states")).toBe(true);
      const row = csv.find((l) => l.startsWith("rule:tx-a-loss,"))!;
      expect(row.endsWith(`,SW=${state}`)).toBe(true);
      // closed form above: 3.5 dB selected (margin 0.5), 33 dB not
      expect(checks.rules[0].worst).toBeCloseTo(state === 1 ? 3.5 : 33, 9);
    }
  });

  it("the sweep summary is the state sweep check's result: worst case per rule, the setting that gives it, counts", () => {
    const content = padSwitch(1, [LOSS, DRIVE]);
    const { checks, solution } = computeBundleResults(content, {});
    const sweep = checks.sweep!;
    // closed forms: the loss rule passes with A selected (margin 4 − 3.5) and fails by 33 − 4 = 29 dB otherwise;
    // the drive rule fails in both (PAD takes 10 dBm against 9.8; with LB selected LB takes 6.5 against 6.2)
    expect(sweep).toMatchObject({ combinations: 2, passing: 0, failing: 2, holds_in_every_setting: false });
    const loss = sweep.rules.find((r) => r.id === "tx-a-loss")!;
    expect(loss).toMatchObject({ passing: 1, failing: 1, worst_states: [2], worst_verdict: "fail", unit: "dB", source: "scenario" });
    expect(loss.worst_margin!).toBeCloseTo(-29, 6);
    expect(loss.shown_margin!).toBeCloseTo(0.5, 6);
    const drive = sweep.rules.find((r) => r.id === "tx-drive")!;
    expect(drive.worst_states).toEqual([2]);
    expect(drive.worst_margin!).toBeCloseTo(6.2 - 6.5, 6);
    expect(drive.shown_margin!).toBeCloseTo(9.8 - 10, 6);
    expect(sweep.failing_settings).toEqual([
      { states: [1], rules: ["tx-drive"] },
      { states: [2], rules: ["tx-a-loss", "tx-drive"] },
    ]);

    // the same rules run as the app's "state sweep" check (executeCheck, as the job pool runs it)
    const set = effectiveRuleSet([], parseScenario(content));
    const outcome = executeCheck({ check: "state_sweep", inputs: {} }, solution, set);
    if (outcome.check !== "state_sweep") throw new Error("expected a state sweep");
    const direct = outcome.figures.result;
    expect(direct.combinations).toBe(sweep.combinations);
    expect(direct.passing).toBe(sweep.passing);
    expect(direct.failing).toBe(sweep.failing);
    direct.rules.forEach((rule, j) => {
      const margins = direct.rows.map((row) => row.cells[j].margin);
      const worstRow = margins.indexOf(Math.min(...margins));
      const summary = sweep.rules.find((r) => r.id === rule.id)!;
      expect(summary.worst_margin).toBe(margins[worstRow]);
      expect(summary.worst_states).toEqual(direct.rows[worstRow].states);
      expect(summary.passing).toBe(direct.rows.filter((row) => row.cells[j].verdict === "pass").length);
    });
    // and the setting shown in the sweep gives the verdicts of the bundle's own solve
    const shown = stateSweep(solution.system, judgingRules(set)).rows[0];
    expect(shown.cells[0].margin).toBeCloseTo(checks.results.rules[0].margin, 9);
  });

  it("says when the rules hold in every setting, and a scenario without switches has one setting", () => {
    const loose = computeBundleResults(padSwitch(2, [{ ...LOSS, max_db: 40 }]), {}).checks.sweep!;
    expect(loose).toMatchObject({ combinations: 2, passing: 2, failing: 0, holds_in_every_setting: true, failing_settings: [] });
    const noSwitch = padSwitch(1, [{ kind: "insertion_loss", id: "pad", from: "TX", to: "A", band: [1e9, 2e9], max_db: 40 }]) as { blocks: unknown[]; links: unknown[]; ports: unknown[] };
    noSwitch.blocks = [{ id: "PAD", kind: "attenuator", params: { loss_db: 3 } }];
    noSwitch.links = [];
    noSwitch.ports = [{ name: "TX", at: "PAD:1" }, { name: "A", at: "PAD:2" }];
    const one = computeBundleResults(noSwitch, {}).checks;
    expect(one.switch_states).toEqual([]);
    expect(one.sweep).toMatchObject({ switches: [], combinations: 1, passing: 1, holds_in_every_setting: true });
  });

  it("the drive table lists failures first, then the smallest margins, unrated parts last, at the closed-form levels", () => {
    const { checks } = computeBundleResults(padSwitch(1, [DRIVE]), {});
    const [table] = checks.drive!;
    expect(table.rule).toBe("tx-drive");
    expect(table.rows.map((r) => [r.block, r.verdict])).toEqual([
      ["PAD", "fail"], // 10 dBm against 9.8: −0.2 dB
      ["SW", "pass"], // 7 dBm against 8: +1 dB
      ["LB", "pass"], // −23 dBm against 6.2: +29.2 dB
    ]);
    expect(table.rows[0].worstDbm).toBeCloseTo(10, 9);
    expect(table.rows[1].worstDbm).toBeCloseTo(7, 9);
    expect(table.rows[2].worstDbm).toBeCloseTo(-23, 6);
    expect(table.rows[2].margin!).toBeCloseTo(29.2, 6);
    const csv = checksCsv(checks).split("\r\n").filter((l) => l.startsWith("drive:"));
    expect(csv.map((l) => l.split(",")[0])).toEqual(["drive:tx-drive:PAD", "drive:tx-drive:SW", "drive:tx-drive:LB"]);
    // unrated blocks go last: the same scenario without the switch's rating
    const unrated = padSwitch(1, [DRIVE]) as { blocks: Record<string, unknown>[] };
    delete unrated.blocks[1].rating_dbm;
    expect(computeBundleResults(unrated, {}).checks.drive![0].rows.map((r) => r.block)).toEqual(["PAD", "LB", "SW"]);
  });

  it("a re-run compares the setting, the sweep and the drive table, and reports a stored sweep that does not come out again", () => {
    const content = padSwitch(1, [LOSS, DRIVE]);
    const { checks } = computeBundleResults(content, {});
    const bundleOf = (doc: ChecksDocument): OpenedBundle => ({
      manifest: { format: "portolan.bundle/1", app: { name: "portolan", version: "0" }, created_at: "", created_by: null, project: { id: "p", name: "p" }, scenario: { id: "s", name: "s" }, revision: { id: "r", number: 1, content_hash: "" }, switch_states: doc.switch_states, files: {} },
      files: new Map([["results/checks.json", JSON.stringify(doc)]]),
      parts: {},
      scenario: content,
    });
    const same = reproduceBundle(bundleOf(checks));
    const names = same.items.map((i) => i.name);
    expect(names).toEqual(expect.arrayContaining(["switch settings", "state sweep", "sweep:tx-a-loss", "sweep:tx-drive", "drive:tx-drive", "manifest switch settings"]));
    expect(same.items.filter((i) => !i.same && i.name !== "composite")).toEqual([]);
    const edited: ChecksDocument = JSON.parse(JSON.stringify(checks));
    edited.sweep!.rules[0].worst_states = [1];
    edited.switch_states![0].state = 2;
    const differs = reproduceBundle(bundleOf(edited));
    expect(differs.reproduced).toBe(false);
    expect(differs.items.filter((i) => !i.same).map((i) => i.name)).toEqual(expect.arrayContaining(["switch settings", "sweep:tx-a-loss", "manifest switch settings"]));
    expect(settingText(["TR", "ASW"], [2, 1])).toBe("TR=2 ASW=1");
  });
});

describe("the report's headline: does the verdict hold in every switch setting", () => {
  const headline = (state: 1 | 2, rules: unknown[]) => sweepHeadline(computeBundleResults(padSwitch(state, rules), {}))!;

  it("holds when the rules pass in both settings, and when they fail in both", () => {
    expect(headline(1, [{ ...LOSS, max_db: 40 }])).toMatchObject({ holds: true, title: "Holds in every switch setting." });
    // the drive rule fails in both settings (PAD takes 10 dBm against its 9.8 dBm rating whatever the switch does)
    expect(headline(1, [DRIVE])).toMatchObject({ holds: true, title: "Fails in every switch setting." });
  });

  it("says the verdict is for the setting shown only when another setting fails, or differs when the shown one fails", () => {
    const passShown = headline(1, [LOSS]);
    expect(passShown).toMatchObject({ holds: false, title: "Not shown to hold in every switch setting." });
    expect(passShown.text).toBe("This verdict is for the setting shown (SW=1) only: the rules pass in 1 of 2 switch settings and fail in 1; the worst is tx-a-loss in SW=2 (margin −29.00 dB).");
    expect(headline(2, [LOSS])).toMatchObject({ holds: false, title: "Differs between switch settings." });
  });
});
