// The switch-setting parts of report.html (issue 18 item 3): the headline saying whether the verdict holds
// in every switch setting or only in the one shown, the setting the verdicts used, the state sweep's worst
// case per rule and the drive check tables. Figures come from checks.json (engine/bundle/settings.ts).
import { formatHz, RULE_SOURCE_LABELS } from "@/engine/checks";
import { settingText, type BundleResults, type DriveTable, type SweepSummary } from "@/engine/bundle";
import { escapeHtml } from "./svg-plot";

const verdictWord = { pass: "PASS", fail: "FAIL", warn: "WARN" } as const;

function verdictCell(v: "pass" | "fail" | "warn" | null): string {
  return v === null ? `<span class="muted">no rating</span>` : `<span class="${v}">${verdictWord[v]}</span>`;
}

function num(x: number | null | undefined, digits = 2): string {
  return typeof x === "number" && Number.isFinite(x) ? x.toFixed(digits) : "—";
}

/** A margin with its sign, as the workspace shows margins ("+3.20", "−1.05"). */
function signed(x: number | null | undefined): string {
  return typeof x === "number" && Number.isFinite(x) ? `${x >= 0 ? "+" : "−"}${Math.abs(x).toFixed(2)}` : "—";
}

function shownText(results: BundleResults): string {
  const sws = results.checks.switch_states ?? [];
  return settingText(sws.map((s) => s.block), sws.map((s) => s.state));
}

/**
 * Whether the verdict holds in every switch setting, as a title and one sentence (null when the bundle has
 * no sweep). "Holds" is about the verdict: rules that fail in every setting hold too (they fail everywhere).
 */
export function sweepHeadline(results: BundleResults): { holds: boolean; title: string; text: string } | null {
  const sweep = results.checks.sweep;
  if (!sweep) return null;
  const shown = shownText(results);
  const only = "Shown for one switch setting only.";
  if (sweep.not_run) return { holds: false, title: only, text: `This verdict is for the setting shown (${shown}): the state sweep was not run (${sweep.not_run}).` };
  if (sweep.switches.length === 0) return { holds: true, title: "Holds in the only setting.", text: "The scenario has no switches, so this verdict covers its only setting." };
  if (sweep.rules.length === 0) return { holds: false, title: only, text: `This verdict is for the setting shown (${shown}): there are no rules to judge the other settings by.` };
  const n = sweep.combinations;
  const shownFails = results.checks.rules.some((r) => r.verdict === "fail");
  if (sweep.holds_in_every_setting) return { holds: true, title: "Holds in every switch setting.", text: `The rules pass in every switch setting the scenario allows (${n} of ${n}), not only in the one shown (${shown}).` };
  if (shownFails && sweep.failing === n) return { holds: true, title: "Fails in every switch setting.", text: `The rules fail in every switch setting the scenario allows (${n} of ${n}), not only in the one shown (${shown}).` };
  const worst = [...sweep.rules].filter((r) => r.worst_margin !== null).sort((a, b) => (a.worst_margin ?? 0) - (b.worst_margin ?? 0))[0];
  const blocks = sweep.switches.map((s) => s.block);
  const where = worst?.worst_states ? `; the worst is ${worst.id} in ${settingText(blocks, worst.worst_states)} (margin ${signed(worst.worst_margin)} dB)` : "";
  const others = `the rules pass in ${sweep.passing} of ${n} switch settings and fail in ${sweep.failing}${sweep.warning > 0 ? `, warn in ${sweep.warning}` : ""}${sweep.unsolved > 0 ? `, do not solve in ${sweep.unsolved}` : ""}${where}.`;
  return shownFails
    ? { holds: false, title: "Differs between switch settings.", text: `The rules fail in the setting shown (${shown}), but ${others}` }
    : { holds: false, title: "Not shown to hold in every switch setting.", text: `This verdict is for the setting shown (${shown}) only: ${others}` };
}

/** The headline box under the report's title. */
export function sweepHeadlineHtml(results: BundleResults): string {
  const h = sweepHeadline(results);
  if (!h) return "";
  return `<p class="reach ${h.holds ? "reach-all" : "reach-one"}" data-testid="sweep-headline"><strong>${escapeHtml(h.title)}</strong> ${escapeHtml(h.text)}</p>`;
}

/** The switch setting every verdict of the report was judged in. */
export function switchSection(results: BundleResults): string {
  const sws = results.checks.switch_states;
  if (sws === undefined) return "";
  if (sws.length === 0) return `<h2>Switch setting judged</h2><p>The scenario has no switch blocks.</p>`;
  const rows = sws
    .map((s) => `<tr><td class="mono">${escapeHtml(s.block)}</td><td>${escapeHtml(s.label ?? "")}</td><td class="num">${s.throws}</td><td class="num">${s.state}</td><td>common (port 1) to port ${s.state + 1}</td></tr>`)
    .join("");
  return `<h2>Switch setting judged</h2>
<p>Every verdict, trace, leak trace and ledger above and below is for this setting (<span class="mono">${escapeHtml(shownText(results))}</span>); the state sweep that follows judges the rules in every other one.</p>
<table><thead><tr><th>Switch</th><th>Label</th><th>Throws</th><th>Throw selected</th><th>Path</th></tr></thead><tbody>${rows}</tbody></table>`;
}

/** The state sweep summary: per rule its worst setting and margin, how many settings pass; failing settings. */
export function sweepSection(results: BundleResults): string {
  const sweep: SweepSummary | undefined = results.checks.sweep;
  if (!sweep) return "";
  const head = `<h2>State sweep: every switch setting</h2>`;
  if (sweep.not_run) return `${head}<p>Not run: ${escapeHtml(sweep.not_run)}</p>`;
  if (sweep.rules.length === 0) return `${head}<p class="muted">No rules, so there is nothing to judge the switch settings by.</p>`;
  const blocks = sweep.switches.map((s) => s.block);
  const rows = sweep.rules
    .map((r) => {
      const unit = r.unit === "dBm" ? "dB" : (r.unit ?? "");
      return `<tr><td>${r.worst_verdict ? verdictCell(r.worst_verdict) : `<span class="muted">not judged</span>`}</td><td class="mono">${escapeHtml(r.id)}</td><td>${r.source ? escapeHtml(RULE_SOURCE_LABELS[r.source]) : ""}</td><td class="num">${r.passing} of ${sweep.combinations}</td><td class="mono">${r.worst_states ? escapeHtml(settingText(blocks, r.worst_states)) : "—"}</td><td class="num">${num(r.worst)} ${escapeHtml(r.unit ?? "")}</td><td class="num">${r.worst_hz === null ? "—" : escapeHtml(formatHz(r.worst_hz))}</td><td class="num">${signed(r.worst_margin)} ${unit}</td><td class="num">${signed(r.shown_margin)} ${unit}</td></tr>`;
    })
    .join("");
  const failing =
    sweep.failing_settings.length === 0
      ? ""
      : `<h3>Settings that fail (${sweep.failing}${sweep.failing > sweep.failing_settings.length ? `, the first ${sweep.failing_settings.length} listed` : ""})</h3>
<table><thead><tr><th>Setting</th><th>Rules that fail there</th></tr></thead><tbody>${sweep.failing_settings
          .map((f) => `<tr><td class="mono">${escapeHtml(settingText(blocks, f.states))}</td><td class="mono">${escapeHtml(f.rules.join(", "))}</td></tr>`)
          .join("")}</tbody></table>`;
  return `${head}
<p>${sweep.combinations} setting${sweep.combinations === 1 ? "" : "s"} of ${sweep.switches.length} switch${sweep.switches.length === 1 ? "" : "es"} (${sweep.switches.map((s) => `${escapeHtml(s.block)}: ${s.throws} throws`).join(", ")}), each solved exactly and judged by the rule set above: ${sweep.passing} pass, ${sweep.failing} fail${sweep.warning > 0 ? `, ${sweep.warning} warn` : ""}${sweep.unsolved > 0 ? `, ${sweep.unsolved} do not solve` : ""}. The built-in checks (ledger, passivity, reciprocity, stability) are judged in the setting shown only.</p>
<table><thead><tr><th>Worst verdict</th><th>Rule</th><th>Source</th><th>Passes in</th><th>Worst setting</th><th>Worst value</th><th>At</th><th>Margin there</th><th>Margin in the setting shown</th></tr></thead><tbody>${rows}</tbody></table>
${failing}`;
}

function driveTable(t: DriveTable): string {
  const rows = t.rows
    .map(
      (b) =>
        `<tr><td>${verdictCell(b.verdict)}</td><td class="mono">${escapeHtml(b.block)}</td><td class="num">${b.ratingDbm === null ? "—" : `${num(b.ratingDbm, 1)} dBm`}</td><td class="num">${num(b.worstDbm)} dBm</td><td class="num">port ${b.worstPort}, ${escapeHtml(formatHz(b.worstHz))}</td><td class="num">${b.margin === null ? "—" : `${signed(b.margin)} dB`}</td></tr>`,
    )
    .join("");
  const sources = t.sources.map((s) => `${escapeHtml(s.port)} ${num(s.dbm, 1)} dBm`).join(", ");
  return `<h3>${escapeHtml(t.rule)}: ${verdictCell(t.verdict)}</h3>
<p>Sources ${sources}; ${t.band ? `${escapeHtml(formatHz(t.band[0]))} – ${escapeHtml(formatHz(t.band[1]))}` : "the whole plan"}; verdict on the ${t.basis} sum. Failures first, then the smallest margins; parts with no rating last.</p>
<table><thead><tr><th>Verdict</th><th>Part</th><th>Rating</th><th>Level reached</th><th>Where</th><th>Margin</th></tr></thead><tbody>${rows}</tbody></table>`;
}

/** The drive check of each drive rule, in the setting shown, with a pointer to the cautions. */
export function driveSection(results: BundleResults): string {
  const tables = results.checks.drive;
  if (tables === undefined) return "";
  const intro = `<h2>Drive check</h2>
<p class="small">Level reached: the highest incident power |a|² at any port of the part over the band, in dBm (10·log10 of the power over 1 mW); margin: rating − level, in dB (IEEE Std 100 definitions of dBm and the decibel; common practice). Estimates from the entered data: read the cautions at the top of this report.</p>`;
  if (tables.length === 0) return `${intro}<p class="muted">No drive rule in the rule set, so no source powers to drive the scenario with and no drive check was made.</p>`;
  return `${intro}${tables.map(driveTable).join("\n")}`;
}

/** CSS of the parts above (the report's other rules apply). */
export const SETTINGS_CSS = `
.reach{border:2px solid;padding:8px 12px;margin:8px 0 12px;background:#FBF8F0}
.reach-all{border-color:#276B5A}.reach-one{border-color:#A63A24}
`;
