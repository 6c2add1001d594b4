import { readFileSync } from "node:fs";
import { expect as baseExpect, test, type Locator, type Page, type TestInfo } from "@playwright/test";
import { demoUsers, signIn } from "./helpers";

// Plots a report can use (issue 15 item 6), as an integration engineer on a copy of the demo's
// "Baseline" (db/seed-scenarios.ts: plan 2.3–2.6 GHz, 301 points; the project rule tx-rx-isolation asks
// for 30 dB from TX to RX over 2.4–2.48 GHz): the isolation limit line on S21 (TX → RX), the trace plot
// and the Smith chart exported as PNG, SVG and CSV, a marker outside the plan refused, and the Smith
// chart zoomed with its read-out under the pointer.
const DEMO_PROJECT = "Kestrel telemetry front end";

test.describe.configure({ timeout: 240_000 });
const expect = baseExpect.configure({ timeout: 40_000 });
test.use({ viewport: { width: 1600, height: 1100 } });

async function openBaselineCopy(page: Page): Promise<void> {
  await signIn(page, demoUsers.engineer.email, demoUsers.engineer.password);
  await expect(page).toHaveURL(/\/projects(\/|$|\?)/, { timeout: 60_000 });
  const origin = new URL(page.url()).origin;
  const { projects } = (await (await page.request.get("/api/projects")).json()) as { projects: { id: string; name: string }[] };
  const projectId = projects.find((p) => p.name === DEMO_PROJECT)!.id;
  const { scenarios } = (await (await page.request.get(`/api/projects/${projectId}/scenarios`)).json()) as { scenarios: { id: string; name: string }[] };
  const baseline = scenarios.find((s) => s.name === "Baseline")!;
  const copy = await page.request.post(`/api/projects/${projectId}/scenarios/${baseline.id}/duplicate`, { data: { name: `Plots ${Date.now()}` }, headers: { origin } });
  expect(copy.status()).toBe(201);
  const scenarioId = ((await copy.json()) as { scenario: { id: string } }).scenario.id;
  await page.goto(`/projects/${projectId}/scenarios/${scenarioId}`);
}

/** A screenshot kept as the test's attachment and beside the other stories' (test-results/screenshots). */
async function shot(testInfo: TestInfo, name: string, target: Page | Locator): Promise<void> {
  await testInfo.attach(name, { body: await target.screenshot({ path: `test-results/screenshots/plots-${name}` }), contentType: "image/png" });
}

/** Downloads what the plot's export menu offers under `item` and returns the file's name and bytes. */
async function exportFrom(page: Page, menuButton: Locator, item: string): Promise<{ name: string; bytes: Buffer }> {
  await menuButton.click();
  const downloading = page.waitForEvent("download");
  await page.getByRole("menuitem", { name: item }).click();
  const download = await downloading;
  return { name: download.suggestedFilename(), bytes: readFileSync((await download.path())!) };
}

/** PNG signature (ISO/IEC 15948, PNG 2nd ed., §5.2): 89 50 4E 47 0D 0A 1A 0A; the IHDR's width and height follow at bytes 16–23. */
function expectPng(bytes: Buffer): { width: number; height: number } {
  expect([...bytes.subarray(0, 8)]).toEqual([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
  expect(bytes.subarray(12, 16).toString("latin1")).toBe("IHDR");
  return { width: bytes.readUInt32BE(16), height: bytes.readUInt32BE(20) };
}

test("an engineer reads the isolation limit on the trace, exports the plots, and reads the Smith chart", async ({ page }, testInfo) => {
  // the exports run under the app's CSP (proxy.ts): blob: images and downloads, no violation reported
  const violations: string[] = [];
  await page.addInitScript(() => {
    document.addEventListener("securitypolicyviolation", (event) => console.error(`securitypolicyviolation: ${event.violatedDirective} ${event.blockedURI}`));
  });
  page.on("console", (message) => {
    if (/securitypolicyviolation|Content Security Policy|Refused to (load|execute|apply|create|connect|frame)/i.test(message.text())) violations.push(message.text());
  });
  await openBaselineCopy(page);
  const results = page.getByRole("region", { name: "Results" });
  const plot = results.locator('svg[data-plot="trace"]');
  await expect(plot).toBeVisible({ timeout: 90_000 });
  await expect(results.getByRole("combobox", { name: "Trace", exact: true })).toHaveValue("1,0"); // S21 (TX → RX)

  // 1. the project's isolation rule draws its limit at −30 dB over 2.4–2.48 GHz, named, failing side shaded
  const limit = plot.locator('[data-limit="tx-rx-isolation"]');
  await expect(limit).toHaveCount(1);
  await expect(plot.getByText("tx-rx-isolation", { exact: true })).toBeVisible();
  await expect(plot.locator('[aria-label="Legend"]')).toContainText("tx-rx-isolation (fails above −30 dB)");
  // the line sits where the y axis says −30 dB is (interpolated between the axis labels on screen) and spans
  // the rule's band on the x axis (interpolated between the frequency labels)
  const geometry = await plot.evaluate((svg) => {
    const read = (sel: string, attr: "x" | "y") =>
      [...svg.querySelectorAll(sel)].map((t) => ({ text: t.textContent ?? "", at: Number(t.getAttribute(attr)) }));
    const line = svg.querySelector('[data-limit="tx-rx-isolation"] line')!;
    const rect = svg.querySelector('[data-limit="tx-rx-isolation"] rect')!;
    return {
      y: read('[data-axis="y"] text[text-anchor="end"]', "y"),
      x: read('[data-axis="x"] text', "x"),
      line: { x1: Number(line.getAttribute("x1")), x2: Number(line.getAttribute("x2")), y: Number(line.getAttribute("y1")) },
      shade: { y: Number(rect.getAttribute("y")), height: Number(rect.getAttribute("height")) },
    };
  });
  const number = (text: string) => Number(text.replace("\u2212", "-").replace(/[^0-9.eE+-]/g, ""));
  const ghz = (text: string) => number(text) * (text.includes("GHz") ? 1e9 : text.includes("MHz") ? 1e6 : 1);
  const yTicks = geometry.y.map((t) => ({ v: number(t.text), at: t.at - 3.5 }));
  const yPerDb = (yTicks[yTicks.length - 1].at - yTicks[0].at) / (yTicks[yTicks.length - 1].v - yTicks[0].v);
  expect(Math.abs(yTicks[0].at + (-30 - yTicks[0].v) * yPerDb - geometry.line.y)).toBeLessThan(1);
  const xTicks = geometry.x.map((t) => ({ v: ghz(t.text), at: t.at }));
  const xPerHz = (xTicks[xTicks.length - 1].at - xTicks[0].at) / (xTicks[xTicks.length - 1].v - xTicks[0].v);
  expect(Math.abs(xTicks[0].at + (2.4e9 - xTicks[0].v) * xPerHz - geometry.line.x1)).toBeLessThan(1);
  expect(Math.abs(xTicks[0].at + (2.48e9 - xTicks[0].v) * xPerHz - geometry.line.x2)).toBeLessThan(1);
  // failing above: the shade runs from the top of the plot down to the line
  expect(Math.abs(geometry.shade.y + geometry.shade.height - geometry.line.y)).toBeLessThan(0.5);
  // 5. round ticks: 1-2-5 steps of whole dB and frequencies written by formatHz
  const steps = yTicks.slice(1).map((t, k) => t.v - yTicks[k].v);
  expect(new Set(steps).size).toBe(1);
  expect([1, 2, 5, 10, 20, 50]).toContain(steps[0]);
  for (const t of geometry.x) expect(t.text).toMatch(/^\d+(\.\d+)? (GHz|MHz)$/);
  await plot.scrollIntoViewIfNeeded();
  await shot(testInfo, "trace-isolation-limit.png", plot);

  // 2. exports: PNG at twice the plot's size, standalone SVG, CSV with units
  const exportTrace = results.getByRole("button", { name: "Export trace plot" });
  const box = (await plot.boundingBox())!;
  const png = await exportFrom(page, exportTrace, "PNG image");
  expect(png.name).toMatch(/^plots-\d+-traces-magnitude\.png$/);
  const size = expectPng(png.bytes);
  expect(size.width).toBe(2 * Math.round(box.width));
  expect(size.height).toBe(2 * Math.round(box.height));
  const svg = await exportFrom(page, exportTrace, "SVG image");
  expect(svg.name).toMatch(/^plots-\d+-traces-magnitude\.svg$/);
  const svgText = svg.bytes.toString("utf8");
  expect(svgText.startsWith('<?xml version="1.0" encoding="UTF-8"?>\n<svg')).toBe(true);
  expect(svgText).toContain('xmlns="http://www.w3.org/2000/svg"');
  expect(svgText).toContain("tx-rx-isolation");
  expect(svgText).not.toContain("var(--"); // every colour resolved: the file opens alone
  expect(svgText).not.toContain("class=");
  const csv = await exportFrom(page, exportTrace, "CSV data");
  expect(csv.name).toMatch(/^plots-\d+-traces-magnitude\.csv$/);
  const lines = csv.bytes.toString("utf8").trim().split("\n");
  expect(lines[0]).toBe("frequency (Hz),S21 (TX → RX) (dB)");
  expect(lines).toHaveLength(1 + 301);
  expect(Number(lines[1].split(",")[0])).toBe(2.3e9);
  expect(Number(lines[301].split(",")[0])).toBe(2.6e9);
  // the standalone SVG opens on its own (a blank page, no app CSS) and looks like the plot
  const viewer = await page.context().newPage();
  await viewer.setContent(`<img alt="exported plot" src="data:image/svg+xml;base64,${svg.bytes.toString("base64")}">`);
  const shown = viewer.getByRole("img", { name: "exported plot" });
  await expect.poll(() => shown.evaluate((img: HTMLImageElement) => img.naturalWidth)).toBe(Math.round(box.width));
  await shot(testInfo, "exported-trace.svg.png", shown);
  await viewer.close();

  // 3. a marker outside the plan is refused with a message, not moved to the edge
  await results.getByLabel("Marker frequency").fill("3 GHz");
  await results.getByRole("button", { name: "Add marker" }).click();
  await expect(results.getByTestId("marker-error")).toHaveText("3 GHz is outside the frequency plan (2.3 GHz to 2.6 GHz): place the marker within it, or widen the plan.");
  await expect(results.getByRole("table", { name: "Markers" })).toHaveCount(0);
  await results.getByLabel("Marker frequency").fill("2.44 GHz");
  await results.getByRole("button", { name: "Add marker" }).click();
  await expect(results.getByRole("table", { name: "Markers" }).getByRole("row").nth(1)).toContainText("2.44 GHz");
  await expect(results.getByTestId("marker-error")).toHaveCount(0);
  // by keyboard on the plot: the arrows move the read-out along the plan, Enter places a marker there
  await plot.focus();
  await page.keyboard.press("ArrowRight");
  await expect(results.locator('output[aria-label="Trace read-out"]')).toContainText("2.3 GHz · S21 (TX → RX)");
  await page.keyboard.press("ArrowRight");
  await page.keyboard.press("Enter");
  await expect(results.getByRole("table", { name: "Markers" }).getByRole("row").nth(2)).toContainText("2.301 GHz");

  // 4. the Smith chart: read-out under the pointer, zoom with the buttons, the keyboard and the wheel
  const smith = results.locator('svg[data-plot="smith"]');
  await smith.scrollIntoViewIfNeeded();
  const pointer = results.locator('output[aria-label="Smith chart pointer read-out"]');
  const NUM = "([\\d.]+(?:e[+-]?\\d+)?)";
  const gammaOf = async () => {
    const m = (await pointer.innerText()).match(new RegExp(`Γ = ${NUM} ∠ (−?${NUM.slice(1, -1)})°`));
    expect(m).not.toBeNull();
    return { mag: Number(m![1]), deg: Number(m![2].replace("\u2212", "-")) };
  };
  const s = (await smith.boundingBox())!;
  const perGamma = s.width / 2.32; // the unzoomed view spans Γ from −1.16 to 1.16
  const cx = s.x + s.width / 2;
  const cy = s.y + s.height / 2;
  // Γ = 0.5 + j0 → z = (1 + Γ)/(1 − Γ) = 3, Z = 150 Ω at the port's 50 Ω (Pozar, 4th ed., §2.4, from memory)
  await page.mouse.move(cx + 0.5 * perGamma, cy);
  await expect(pointer).toContainText("Pointer: Γ = ");
  const g = await gammaOf();
  expect(Math.abs(g.mag - 0.5)).toBeLessThan(0.01);
  const reading = (await pointer.innerText()).match(new RegExp(`z = ${NUM} [+−] j${NUM} · Z = ${NUM} [+−] j${NUM} Ω`));
  expect(reading).not.toBeNull();
  // one pixel is about 0.006 in Γ near Γ = 0.5; dz/dΓ = 2/(1 − Γ)² = 8 there, so allow 0.06 in z and 3 Ω in Z
  expect(Math.abs(Number(reading![1]) - 3)).toBeLessThan(0.06);
  expect(Math.abs(Number(reading![3]) - 150)).toBeLessThan(3);
  await shot(testInfo, "smith-readout.png", results.locator("figure").filter({ has: page.locator('svg[data-plot="smith"]') }));

  const zoomLabel = results.getByTestId("smith-zoom");
  await expect(zoomLabel).toHaveText("1×");
  await results.getByRole("button", { name: "Zoom in on the Smith chart" }).click();
  await expect(zoomLabel).toHaveText("1.5×");
  await smith.focus();
  await page.keyboard.press("+");
  await expect(zoomLabel).toHaveText("2.25×");
  await page.keyboard.press("0");
  await expect(zoomLabel).toHaveText("1×");
  await expect(results.getByRole("button", { name: "Reset the Smith chart zoom" })).toBeDisabled();
  // the wheel zooms about the pointer: the Γ under it stays under it (where the chart is now: focusing
  // it may have scrolled the results pane)
  const z = (await smith.boundingBox())!;
  const [zx, zy] = [z.x + z.width / 2 + 0.5 * perGamma, z.y + z.height / 2 - 0.3 * perGamma];
  await page.mouse.move(zx, zy);
  await page.mouse.wheel(0, -400);
  await expect.poll(async () => number((await zoomLabel.innerText()).replace("×", ""))).toBeGreaterThan(1.5);
  await page.mouse.move(zx + 1, zy);
  await page.mouse.move(zx, zy);
  const after = await gammaOf();
  // |0.5 + j0.3| = 0.5831, ∠ 30.96°
  expect(Math.abs(after.mag - Math.hypot(0.5, 0.3))).toBeLessThan(0.01);
  expect(Math.abs(after.deg - (Math.atan2(0.3, 0.5) * 180) / Math.PI)).toBeLessThan(1);
  await shot(testInfo, "smith-zoomed.png", results.locator("figure").filter({ has: page.locator('svg[data-plot="smith"]') }));

  // the Smith chart exports too
  const smithCsv = await exportFrom(page, results.getByRole("button", { name: "Export Smith chart" }), "CSV data");
  expect(smithCsv.name).toMatch(/^plots-\d+-smith-tx\.csv$/);
  expect(smithCsv.bytes.toString("utf8").split("\n")[0]).toBe("frequency (Hz),Re S11 at TX (1),Im S11 at TX (1),|S11 at TX| (1),arg S11 at TX (deg),R at TX (Ω),X at TX (Ω)");
  const smithPng = await exportFrom(page, results.getByRole("button", { name: "Export Smith chart" }), "PNG image");
  expectPng(smithPng.bytes);
  expect(violations).toEqual([]);
  await shot(testInfo, "results-panel.png", results);
});
