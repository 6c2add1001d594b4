import { expect, it } from "vitest";
import { evaluateQuantity, expressionsReady, loadExpressions, resolveVariables } from "@/lib/browser/expressions";

// mathjs loads on demand (a separate chunk in the browser): before it has, evaluation says so and no
// number comes out; variables that are plain numbers still resolve.
it("before the expression reader has loaded, evaluation answers 'still loading', never a wrong value", async () => {
  expect(expressionsReady()).toBe(false);
  const early = evaluateQuantity("2.45 GHz", "Hz");
  expect(early.ok).toBe(false);
  expect(early.ok ? "" : early.error).toMatch(/still loading/);
  const { scope, errors } = resolveVariables({ N: 4, L: "0.3 m" });
  expect(scope.get("N")).toBe(4);
  expect(scope.has("L")).toBe(false);
  expect(errors.L).toMatch(/still loading/);
  await loadExpressions();
  expect(expressionsReady()).toBe(true);
  expect(evaluateQuantity("2.45 GHz", "Hz")).toMatchObject({ ok: true, value: 2.45e9 });
});

