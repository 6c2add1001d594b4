// report.html of a bundle: one self-contained, printable page (inline CSS and SVG, system fonts, no
// scripts, no external requests) with the verdicts, whether they hold in every switch setting (state sweep),
// the drive check, |S| traces, leak traces, power ledgers and cautions.
import { DRIVE_CAUTIONS, formatHz, RULE_SOURCE_LABELS } from "@/engine/checks";
import { ruleText } from "@/lib/domain/rules/describe";
import type { BundleManifest, BundleResults } from "@/engine/bundle";
import { escapeHtml, svgPlot, type PlotTrace } from "./svg-plot";
import { driveSection, SETTINGS_CSS, sweepHeadlineHtml, sweepSection, switchSection } from "./report-settings";

export type ReportInput = {
  identity: Omit<BundleManifest, "files" | "format">;
  results: BundleResults;
  /** SHA-256 of the other files of the bundle, listed at the end of the report */
  files: { path: string; sha256: string }[];
};

const CSS = `
:root{color-scheme:light}
body{margin:0;background:#F4EFE2;color:#1D2936;font:14px/1.45 system-ui,-apple-system,"Segoe UI",sans-serif}
main{max-width:960px;margin:0 auto;padding:24px}
h1{font-size:22px;margin:0 0 4px}h2{font-size:17px;margin:28px 0 8px;border-bottom:1px solid #CDBF9F;padding-bottom:4px}
h3{font-size:14px;margin:16px 0 6px}
table{border-collapse:collapse;width:100%;margin:6px 0 12px;background:#FBF8F0}
th,td{border:1px solid #CDBF9F;padding:4px 6px;text-align:left;vertical-align:top}
th{background:#EDE5D1;font-weight:600}
.num,.mono{font-family:ui-monospace,"SFMono-Regular",Menlo,Consolas,monospace;font-variant-numeric:tabular-nums}
.num{text-align:right;white-space:nowrap}
.pass{color:#276B5A;font-weight:700}.fail{color:#A63A24;font-weight:700}.warn{color:#7D5812;font-weight:700}
.muted{color:#55606B}.small{font-size:12px}
.caution{border:2px solid #B8432B;background:#FBF1EC;padding:8px 12px;margin:12px 0}
.caution ul{margin:4px 0 0 18px;padding:0}
dl{display:grid;grid-template-columns:max-content 1fr;gap:2px 12px;margin:8px 0}dt{font-weight:600}dd{margin:0}
figure{margin:8px 0 16px;break-inside:avoid}
@media print{body{background:#fff}main{padding:0}h2{break-after:avoid}table,figure{break-inside:avoid}}
`;

const verdictWord = { pass: "PASS", fail: "FAIL", warn: "WARN" } as const;

function verdictCell(v: "pass" | "fail" | "warn"): string {
  return `<span class="${v}">${verdictWord[v]}</span>`;
}

function num(x: unknown, digits = 2): string {
  return typeof x === "number" && Number.isFinite(x) ? x.toFixed(digits) : "—";
}

function db20(re: number, im: number): number {
  const m = Math.hypot(re, im);
  return m > 0 ? 20 * Math.log10(m) : -400;
}

function hzScale(maxHz: number): [number, string] {
  return maxHz >= 1e9 ? [1e9, "GHz"] : maxHz >= 1e6 ? [1e6, "MHz"] : maxHz >= 1e3 ? [1e3, "kHz"] : [1, "Hz"];
}

function tracesSection(results: BundleResults): string {
  const sol = results.solution;
  const n = sol.ports.length;
  const f = Array.from(sol.frequencies);
  const [scale, unit] = hzScale(f[f.length - 1]);
  const x = f.map((v) => v / scale);
  // one shaded band per distinct range (rules often share a band), labelled with every rule on it
  const byRange = new Map<string, { from: number; to: number; label: string }>();
  results.checks.rule_set.rules.forEach(({ rule: r, not_run }) => {
    if (!r.band || not_run) return;
    const key = `${r.band[0]}-${r.band[1]}`;
    const label = `${r.id} (${r.kind})`;
    const seen = byRange.get(key);
    if (seen) seen.label += `, ${label}`;
    else byRange.set(key, { from: r.band[0] / scale, to: r.band[1] / scale, label });
  });
  const bands = [...byRange.values()];
  const out: string[] = [];
  for (let j = 0; j < n; j++) {
    const traces: PlotTrace[] = [];
    for (let i = 0; i < n; i++) {
      const y = f.map((_, k) => {
        const at = 2 * ((k * n + i) * n + j);
        return db20(sol.s.data[at], sol.s.data[at + 1]);
      });
      traces.push({ label: `|S${i + 1}${j + 1}| ${sol.ports[j]}→${sol.ports[i]}`, x, y });
    }
    const top = Math.max(...traces.flatMap((t) => t.y));
    out.push(`<figure>${svgPlot(traces, { title: `Driven at ${sol.ports[j]}: |S| in dB`, xLabel: `frequency (${unit})`, yLabel: "|S| (dB)", yFloor: top - 100, bands })}</figure>`);
  }
  return out.join("\n");
}

function verdictTable(results: BundleResults): string {
  const all = results.checks.results;
  const rules = new Map(all.rules.map((r) => [`rule:${r.id}`, r]));
  const rows = all.checks.map((c) => {
    const r = rules.get(c.name);
    const figures = r
      ? `worst ${num(r.worst)} ${r.unit}${r.direction ? ` (${escapeHtml(r.direction)})` : ""} at ${escapeHtml(formatHz(r.worstHz))}; limit ${num(r.limit)} ${r.unit}; margin ${num(r.margin)} ${r.unit === "dBm" ? "dB" : r.unit}`
      : "";
    // a rule's first message restates the figures shown above it
    const messages = c.messages.slice(r ? 1 : 0, 4).map((m) => `<div class="small muted">${escapeHtml(m)}</div>`).join("");
    return `<tr><td>${verdictCell(c.verdict)}</td><td class="mono">${escapeHtml(c.name)}</td><td>${escapeHtml(c.title)}</td><td class="mono small">${figures}${messages}</td></tr>`;
  });
  return `<table><thead><tr><th>Verdict</th><th>Check</th><th>What</th><th>Figures</th></tr></thead><tbody>${rows.join("")}</tbody></table>`;
}

/** The effective rule set the verdicts were judged by: each rule with its source and verdict; opt-outs with their reasons. */
function ruleSetSection(results: BundleResults): string {
  const doc = results.checks;
  const verdicts = new Map(doc.rules.map((r) => [r.id, r]));
  const rows = doc.rule_set.rules.map((entry) => {
    const v = verdicts.get(entry.id);
    const verdict = !v || v.verdict === "not run" ? `<span class="muted">NOT RUN</span>` : verdictCell(v.verdict);
    const override = entry.project_rule
      ? `<div class="small muted">overrides the project's ${escapeHtml(ruleText(entry.project_rule))}${entry.by ? `; changed by ${escapeHtml(entry.by)}` : ""}${entry.at ? ` on ${escapeHtml(entry.at)}` : ""}</div>`
      : "";
    const note = entry.not_run ?? entry.note;
    return `<tr><td>${verdict}</td><td class="mono">${escapeHtml(entry.id)}</td><td>${escapeHtml(RULE_SOURCE_LABELS[entry.source])}</td><td>${escapeHtml(ruleText(entry.rule))}${override}${note ? `<div class="small muted">${escapeHtml(note)}</div>` : ""}</td></tr>`;
  });
  for (const o of doc.rule_set.opted_out) {
    rows.push(`<tr><td><span class="muted">OPTED OUT</span></td><td class="mono">${escapeHtml(o.id)}</td><td>project</td><td>${o.project_rule ? escapeHtml(ruleText(o.project_rule)) : "(no longer a project rule)"}<div class="small">reason: ${escapeHtml(o.reason)}${o.by ? ` (${escapeHtml(o.by)}${o.at ? `, ${escapeHtml(o.at)}` : ""})` : ""}</div></td></tr>`);
  }
  if (rows.length === 0) return `<p class="muted">No rules: the project has none and the scenario adds none.</p>`;
  return `<table><thead><tr><th>Verdict</th><th>Rule</th><th>Source</th><th>Requirement</th></tr></thead><tbody>${rows.join("")}</tbody></table>
<p class="small muted">Rule set SHA-256 <span class="mono">${escapeHtml(doc.rule_set.sha256)}</span>, engine ${escapeHtml(doc.engine_version)}.</p>`;
}

/** Waivers given by reviewers who approved this revision although rules failed. */
function waiverSection(results: BundleResults): string {
  const waivers = results.checks.waivers;
  if (waivers.length === 0) return "";
  const items = waivers
    .map(
      (w) =>
        `<h3>Approved with a waiver by ${escapeHtml(w.reviewer)} on ${escapeHtml(w.decided_at)}</h3><table><thead><tr><th>Failing rule waived</th><th>Reason</th></tr></thead><tbody>${w.rules
          .map((r) => `<tr><td class="mono">${escapeHtml(r.id)}</td><td>${escapeHtml(r.reason)}</td></tr>`)
          .join("")}</tbody></table>${w.comment ? `<p class="small">Comment: ${escapeHtml(w.comment)}</p>` : ""}`,
    )
    .join("\n");
  return `<h2>Waivers</h2>${items}`;
}

function leakSection(results: BundleResults): string {
  const leaks = results.checks.leaks;
  if (leaks.length === 0) return `<p class="muted">The scenario has no isolation rules, so no leak traces were made.</p>`;
  return leaks
    .map((l) => {
      const head = `<h3>${escapeHtml(l.rule)}: ${escapeHtml(l.from)} → ${escapeHtml(l.to)}</h3>`;
      if (!l.trace) return `${head}<p class="muted">Not traced: ${escapeHtml(l.error ?? "")}</p>`;
      const t = l.trace;
      const rows = t.paths.map((p) => `<tr><td class="num">${p.rank}</td><td class="num">${num(p.db)}</td><td class="num">${num(p.phaseDeg, 1)}</td><td class="mono small">${escapeHtml(p.text)}</td></tr>`).join("");
      const whatIf = t.whatIf
        .map((w) => `<tr><td class="mono">${escapeHtml(w.block)}</td><td>${escapeHtml(w.ideal)}</td><td class="num">${num(w.valueDb)}</td><td class="num">${num(w.improvementDb)}</td></tr>`)
        .join("");
      return `${head}<p>At ${escapeHtml(formatHz(t.frequencyHz))} (worst point of the band): composite |S| ${num(t.trueDb)} dB; the listed paths sum to ${num(t.listedSumDb)} dB (${t.ranking} ranking, residual ${num(t.residualRelativeDb)} dB relative).</p>
<table><thead><tr><th>#</th><th>dB</th><th>phase (°)</th><th>path</th></tr></thead><tbody>${rows}</tbody></table>
${whatIf ? `<table><thead><tr><th>Block made ideal</th><th>meaning</th><th>|S| then (dB)</th><th>improvement (dB)</th></tr></thead><tbody>${whatIf}</tbody></table>` : ""}`;
    })
    .join("\n");
}

function lineupSection(results: BundleResults): string {
  const lineups = results.checks.lineups ?? [];
  if (lineups.length === 0) return "";
  const body = lineups
    .map((l) => {
      const head = `<h3>${escapeHtml(l.rule)}: ${escapeHtml(l.from)} → ${escapeHtml(l.to)}</h3>`;
      if (!l.lineup) return `${head}<p class="muted">No line-up: ${escapeHtml(l.error ?? "")}</p>`;
      const r = l.lineup;
      const k = Math.floor((r.frequencies.length - 1) / 2);
      const levels = r.inputDbm !== null;
      const rows = r.stages
        .map(
          (s) =>
            `<tr><td class="mono">${escapeHtml(`${s.block} ${s.inPort}→${s.outPort}`)}</td><td class="num">${num(s.gainDb[k])}</td><td class="num">${num(s.cumulativeGainDb[k])}</td><td class="num">${num(s.cumulativeNfDb[k])}</td>${levels ? `<td class="num">${num(s.levelOutDbm?.[k])}</td><td class="num">${s.headroomDb ? num(s.headroomDb[k]) : "—"}</td>` : ""}<td class="num">${num(s.cumulativeOip3Dbm[k])}</td><td class="num">${num(s.cumulativeOp1dbDbm[k])}</td></tr>`,
        )
        .join("");
      return `${head}<p>Path: <span class="mono">${escapeHtml(r.path.text)}</span>; figures at ${escapeHtml(formatHz(r.frequencies[k]))}${levels ? ` for ${num(r.inputDbm)} dBm in` : ""}; end to end gain ${num(r.gainDb[k])} dB, noise figure ${num(r.nfDb[k])} dB.</p>
<table><thead><tr><th>Stage</th><th>gain (dB)</th><th>cum. gain (dB)</th><th>cum. NF (dB)</th>${levels ? "<th>level out (dBm)</th><th>headroom (dB)</th>" : ""}<th>cum. OIP3 (dBm)</th><th>cum. OP1dB (dBm)</th></tr></thead><tbody>${rows}</tbody></table>`;
    })
    .join("\n");
  return `<h2>Line-ups of the noise, gain and headroom rules</h2>
<p class="small muted">Gain from the actual waves; noise figure through the interconnection; cascade OIP3 and OP1dB by the usual formulas (common practice).</p>
${body}`;
}

/** The revision's current spread analysis (when it has one): yield per rule with its 95% Wilson interval. */
function spreadSection(results: BundleResults): string {
  const spread = results.checks.spread;
  if (!spread) return "";
  const pct = (x: number) => `${(100 * x).toFixed(1)}%`;
  const rows = spread.rules
    .map((r) => `<tr><td class="mono">${escapeHtml(r.id)}</td><td class="num">${r.passed}/${r.total}</td><td class="num">${pct(r.yield)}</td><td class="num">${pct(r.low)}–${pct(r.high)}</td><td class="num">${num(r.nominal_margin)}</td></tr>`)
    .join("");
  return `<h2>Spread analysis</h2>
<p>${spread.samples} samples, seed <span class="mono">${spread.seed}</span>, judged by the rule set above with this engine. Yield: the fraction of samples that meet the rule; the interval is the 95% Wilson score interval.</p>
<table><thead><tr><th>Rule</th><th>passed</th><th>yield</th><th>95% interval</th><th>nominal margin</th></tr></thead><tbody>${rows}</tbody></table>`;
}

function ledgerSection(results: BundleResults): string {
  const ledgers = results.checks.results.ledgers;
  return ledgers
    .map((l) => {
      const k = Math.floor(l.frequenciesHz.length / 2);
      const pct = (x: number | undefined) => (x === undefined ? "—" : `${(100 * x).toFixed(3)} %`);
      const rows: string[] = [`<tr><td>reflected back out of ${escapeHtml(l.port)}</td><td class="num">${pct(l.reflected[k])}</td></tr>`];
      for (const o of l.outputs) rows.push(`<tr><td>out of ${escapeHtml(o.port)}</td><td class="num">${pct(o.fraction[k])}</td></tr>`);
      for (const b of l.blocks) rows.push(`<tr><td>${b.role} in ${escapeHtml(b.block)} (${escapeHtml(b.kind)})</td><td class="num">${pct(b.fraction[k])}</td></tr>`);
      for (const t of l.terminations) rows.push(`<tr><td>open port ${escapeHtml(t.block)}:${t.port} (matched termination)</td><td class="num">${pct(t.fraction[k])}</td></tr>`);
      rows.push(`<tr><th>closure Σ − 1</th><th class="num">${(l.closure[k] ?? 0).toExponential(2)}</th></tr>`);
      return `<h3>Power entering ${escapeHtml(l.port)} at ${escapeHtml(formatHz(l.frequenciesHz[k]))} ${verdictCell(l.verdict)}</h3>
<table><thead><tr><th>Where it goes</th><th>Share of incident power</th></tr></thead><tbody>${rows.join("")}</tbody></table>
<p class="small muted">Worst closure over the plan: ${l.worstClosure.toExponential(2)} at ${escapeHtml(formatHz(l.worstClosureHz))}.</p>`;
    })
    .join("\n");
}

/**
 * Renders report.html for a bundle.
 *
 * @example renderReportHtml({ identity, results, files }).startsWith("<!doctype html>")
 */
export function renderReportHtml({ identity, results, files }: ReportInput): string {
  const all = results.checks.results;
  const sol = results.solution;
  const warnings = all.warnings.length > 0 ? `<h2>Warnings</h2><ul>${all.warnings.map((w) => `<li>${escapeHtml(w)}</li>`).join("")}</ul>` : "";
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escapeHtml(identity.scenario.name)}: revision ${identity.revision.number} (Portolan review bundle)</title>
<style>${CSS}${SETTINGS_CSS}</style></head>
<body><main>
<h1>${escapeHtml(identity.scenario.name)}, revision ${identity.revision.number}: ${verdictCell(all.verdict)}</h1>
${sweepHeadlineHtml(results)}
<p class="muted">Portolan review bundle (${escapeHtml(identity.app.name)} ${escapeHtml(identity.app.version)})</p>
<dl>
<dt>Project</dt><dd>${escapeHtml(identity.project.name)}</dd>
<dt>Scenario</dt><dd>${escapeHtml(identity.scenario.name)} <span class="mono small muted">${escapeHtml(identity.scenario.id)}</span></dd>
<dt>Revision</dt><dd>${identity.revision.number} <span class="mono small muted">content SHA-256 ${escapeHtml(identity.revision.content_hash)}</span></dd>
<dt>Exported</dt><dd>${escapeHtml(identity.created_at)}${identity.created_by ? ` by ${escapeHtml(identity.created_by.name)} &lt;${escapeHtml(identity.created_by.email)}&gt;` : ""}</dd>
<dt>System ports</dt><dd>${sol.ports.map((p, i) => `${escapeHtml(p)} (Z0 ${sol.portZ0[i]} Ω)`).join(", ")}</dd>
<dt>Plan</dt><dd>${sol.frequencies.length} points, ${escapeHtml(formatHz(sol.frequencies[0]))} – ${escapeHtml(formatHz(sol.frequencies[sol.frequencies.length - 1]))}</dd>
</dl>
<div class="caution" role="note"><strong>Cautions</strong><ul>${DRIVE_CAUTIONS.map((c) => `<li>${escapeHtml(c)}</li>`).join("")}</ul></div>
<h2>Rules judged by</h2>
${ruleSetSection(results)}
${waiverSection(results)}
${switchSection(results)}
<h2>Verdicts</h2>
${verdictTable(results)}
${warnings}
${sweepSection(results)}
${driveSection(results)}
<h2>Traces</h2>
${tracesSection(results)}
<h2>Leak traces of the isolation rules</h2>
${leakSection(results)}
${lineupSection(results)}
${spreadSection(results)}
<h2>Power ledger</h2>
${ledgerSection(results)}
<h2>Files of this bundle</h2>
<p class="small">Check the bundle on any machine with <span class="mono">npm run -s portolan -- check bundle.zip</span>: it verifies these hashes and re-runs the checks from scenario.json and parts/.</p>
<table><thead><tr><th>File</th><th>SHA-256</th></tr></thead><tbody>${files.map((f) => `<tr><td class="mono">${escapeHtml(f.path)}</td><td class="mono small">${f.sha256}</td></tr>`).join("")}</tbody></table>
</main></body></html>
`;
}
