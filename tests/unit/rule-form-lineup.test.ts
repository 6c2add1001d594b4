// The rules form for the line-up rule kinds (noise_figure, gain, headroom): form → spec → form round trips,
// and per-field messages for what is missing.
import { beforeAll, describe, expect, it } from "vitest";
import { EMPTY_RULE_FORM, formFromSpec, specFromForm } from "@/components/rules/rule-form";
import { loadExpressions } from "@/lib/browser/expressions";

// the expression reader (mathjs) loads on demand
beforeAll(() => loadExpressions());

describe("rules form: noise figure, gain, headroom", () => {
  it("turns typed values into the engine's rules and back", () => {
    const cases = [
      { ...EMPTY_RULE_FORM, id: "nf", kind: "noise_figure" as const, from: "ANT", to: "RX", band: "2.4 GHz to 2.48 GHz", limit: "3.5" },
      { ...EMPTY_RULE_FORM, id: "g", kind: "gain" as const, from: "ANT", to: "RX", band: "2.4 GHz to 2.48 GHz", limit: "", limitMax: "35" },
      { ...EMPTY_RULE_FORM, id: "h", kind: "headroom" as const, from: "ANT", to: "RX", band: "", limit: "6", inputDbm: "-20 dBm" },
    ];
    const specs = cases.map((c) => specFromForm(c));
    expect(specs.map((r) => (r.ok ? r.spec : r.fields))).toEqual([
      { kind: "noise_figure", id: "nf", from: "ANT", to: "RX", band: [2.4e9, 2.48e9], max_db: 3.5 },
      { kind: "gain", id: "g", from: "ANT", to: "RX", band: [2.4e9, 2.48e9], max_db: 35 },
      { kind: "headroom", id: "h", from: "ANT", to: "RX", input_dbm: -20, min_db: 6 },
    ]);
    for (const r of specs) {
      if (!r.ok) throw new Error("expected a spec");
      const again = specFromForm(formFromSpec(r.spec as Parameters<typeof formFromSpec>[0]));
      expect(again).toEqual(r);
    }
  });

  it("names the field that is missing or wrong", () => {
    const none = specFromForm({ ...EMPTY_RULE_FORM, id: "g", kind: "gain", from: "A", to: "B", band: "1 GHz to 2 GHz" });
    expect(none).toEqual({ ok: false, fields: { limit: "Give a least gain or a largest gain." } });
    const crossed = specFromForm({ ...EMPTY_RULE_FORM, id: "g", kind: "gain", from: "A", to: "B", band: "1 GHz to 2 GHz", limit: "30", limitMax: "20" });
    expect(crossed).toEqual({ ok: false, fields: { limitMax: "The least gain must not be above the largest." } });
    const level = specFromForm({ ...EMPTY_RULE_FORM, id: "h", kind: "headroom", from: "A", to: "B", limit: "3", inputDbm: "" });
    expect(level).toEqual({ ok: false, fields: { inputDbm: "Enter the input level." } });
  });
});
