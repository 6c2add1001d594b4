import type { RuleSpec, Scenario } from "@/engine/types";
import { can, type Action, type Role } from "@/lib/base/permission-table";
import { ADDABLE_KINDS, kindTitle } from "@/lib/browser/catalogue";
import { nextSystemPortName, portCountOf, switchThrows, type PartSummary } from "@/lib/browser/scenario-model";
import { effectiveRuleSet, judgingRules } from "@/engine/checks";
import type { HelmScenarioActions } from "./helm-context";
import { formatBand, parseBand, parseDb, parseFrequency, parseSources, type Parsed } from "./parse-input";
import { SPREAD_MAX_SAMPLES } from "@/lib/domain/checks/inputs";

export type HelmOption = { value: string; label: string; hint?: string };

/** One argument a command asks for inside the palette. */
export type HelmStep =
  | { kind: "choose"; key: string; prompt: string; options: HelmOption[] }
  | { kind: "text"; key: string; prompt: string; initial: string; hint?: string; parse: (text: string) => Parsed<unknown> };

export type HelmGroup = "Checks" | "Actions" | "Navigation";

export type HelmCommand = {
  id: string;
  title: string;
  group: HelmGroup;
  keywords?: string[];
  /** keys shown as a hint (the workspace's own shortcut for the same thing) */
  shortcut?: string[];
  /** the next argument to ask for, given those collected so far; null when ready */
  next?: (values: Record<string, unknown>) => HelmStep | null;
  run: (values: Record<string, unknown>) => void | Promise<void>;
};

export type HelmProject = { id: string; name: string; role: Role };

export type HelmData = {
  navigate: (href: string) => void;
  projects: HelmProject[];
  projectId: string | null;
  role: Role | null;
  scenarios: { id: string; name: string }[];
  parts: { id: string; name: string; fileName: string }[];
  rules: RuleSpec[];
  page: HelmScenarioActions | null;
};

/** The plan's first and last frequency. */
export function planRange(scenario: Scenario): [number, number] | null {
  const f = scenario.frequency as { start?: number; stop?: number; list?: number[] };
  if (typeof f.start === "number" && typeof f.stop === "number") return [f.start, f.stop];
  if (Array.isArray(f.list) && f.list.length > 0) return [Math.min(...f.list), Math.max(...f.list)];
  return null;
}

/** Default source and target ports: TX and RX when the scenario names them, else the first two ports. */
export function defaultPair(ports: readonly string[]): [string, string] {
  const from = ports.find((p) => /^tx\b/i.test(p)) ?? ports[0] ?? "";
  const to = ports.find((p) => /^rx\b/i.test(p) && p !== from) ?? ports.find((p) => p !== from) ?? "";
  return [from, to];
}

/**
 * The ports a rule names for this kind of check, when they are on the scenario: an insertion loss rule for
 * insertion loss, else the main path that a line-up rule (gain, noise figure, headroom) names. TX→RX is
 * the isolation pair, so insertion loss must not fall back to it while a rule says which path matters.
 */
export function rulePair(rules: readonly RuleSpec[], ports: readonly string[], kinds: readonly string[]): [string, string] | null {
  for (const kind of kinds) {
    for (const r of rules) {
      if (r.kind !== kind || !("from" in r) || !("to" in r)) continue;
      const { from, to } = r as { from: unknown; to: unknown };
      if (typeof from === "string" && typeof to === "string" && ports.includes(from) && ports.includes(to)) return [from, to];
    }
  }
  return null;
}

/** Level assumed for a drive check when no drive rule gives one: modest, so no part is overdriven by default. */
export const DEFAULT_DRIVE_DBM = 20;

function orderFirst(ports: readonly string[], first: string): HelmOption[] {
  return [first, ...ports.filter((p) => p !== first)].filter(Boolean).map((p, i) => ({ value: p, label: p, hint: i === 0 ? "default" : undefined }));
}

type RuleKind = "isolation" | "match" | "insertion_loss";

/** An optional level in dBm ("-30", "-30 dBm"); blank means none (null). */
function parseOptionalDbm(text: string): Parsed<number | null> {
  if (text.trim() === "") return { ok: true, value: null };
  const r = parseDb(text.replace(/m\s*$/i, ""));
  return r.ok ? r : { ok: false, error: "Enter a level in dBm, or leave it blank." };
}

/** A spread analysis's sample count (a whole number within the server's limit). */
function parseSamples(text: string): Parsed<number> {
  const n = Number(text.trim());
  return Number.isInteger(n) && n >= 1 && n <= SPREAD_MAX_SAMPLES ? { ok: true, value: n } : { ok: false, error: `Enter a whole number from 1 to ${SPREAD_MAX_SAMPLES}.` };
}

/** A spread analysis's seed: a whole number ≥ 0, or blank for one the server draws (null). */
function parseSeed(text: string): Parsed<number | null> {
  if (text.trim() === "") return { ok: true, value: null };
  const n = Number(text.trim());
  return Number.isSafeInteger(n) && n >= 0 ? { ok: true, value: n } : { ok: false, error: "Enter a whole number (0 or more), or leave it blank." };
}

/** The rule of this kind that best fits the chosen ports (for default bands and limits). */
function ruleFor(rules: RuleSpec[], kind: RuleKind, values: Record<string, unknown>): RuleSpec | undefined {
  const same = rules.filter((r) => r.kind === kind);
  if (kind === "match") return same.find((r) => r.kind === "match" && r.port === values.port) ?? same[0];
  return same.find((r) => "from" in r && r.from === values.from && r.to === values.to) ?? same[0];
}

function bandStep(rules: RuleSpec[], kind: RuleKind | null, scenario: Scenario, values: Record<string, unknown>, key = "band"): HelmStep {
  const rule = kind ? ruleFor(rules, kind, values) : undefined;
  const bandOf = (r: RuleSpec | undefined): [number, number] | undefined => (r && "band" in r && Array.isArray(r.band) ? r.band : undefined);
  const band = bandOf(rule) ?? rules.map(bandOf).find(Boolean) ?? planRange(scenario);
  return { kind: "text", key, prompt: "Band", initial: band ? formatBand(band) : "", hint: "e.g. 2.4 GHz to 2.48 GHz", parse: parseBand };
}

function portSteps(ports: string[], keys: ("from" | "to" | "port")[], values: Record<string, unknown>, pair: [string, string] | null = null): HelmStep | null {
  const [defFrom, defTo] = pair ?? defaultPair(ports);
  for (const key of keys) {
    if (values[key] !== undefined) continue;
    const prompt = key === "from" ? "From port" : key === "to" ? "To port" : "Port";
    const def = key === "to" ? (defTo === values.from ? ports.find((p) => p !== values.from) ?? defTo : defTo) : defFrom;
    const options = orderFirst(key === "to" ? ports.filter((p) => p !== values.from) : ports, key === "to" ? def : defFrom);
    return { kind: "choose", key, prompt, options };
  }
  return null;
}

/** Every command the helm offers on this page for this role. */
export function buildCommands(data: HelmData): HelmCommand[] {
  const { navigate, projects, projectId, scenarios, parts, page } = data;
  const role = page?.role ?? data.role;
  const allowed = (action: Action) => can(role, action);
  const commands: HelmCommand[] = [];
  const base = projectId ? `/projects/${projectId}` : null;

  // --- checks (on a scenario page)
  if (page && allowed("check.run")) {
    const scenario = page.scenario;
    const ports = scenario.ports.map((p) => p.name);
    const rules = judgingRules(effectiveRuleSet(data.rules, scenario));
    const limitStep = (kind: RuleKind, values: Record<string, unknown>, key: string, prompt: string, fallback: number): HelmStep => {
      const rule = ruleFor(rules, kind, values) as Record<string, unknown> | undefined;
      const value = typeof rule?.[key] === "number" ? (rule[key] as number) : fallback;
      return { kind: "text", key, prompt, initial: String(value), hint: "dB", parse: parseDb };
    };
    commands.push(
      {
        id: "check.isolation",
        title: "Run isolation check",
        group: "Checks",
        keywords: ["isolation", "leakage", "rule"],
        next: (v) => portSteps(ports, ["from", "to"], v) ?? (v.band ? null : bandStep(rules, "isolation", scenario, v)) ?? null,
        run: () => undefined,
      },
      {
        id: "check.match",
        title: "Run match check",
        group: "Checks",
        keywords: ["return loss", "vswr"],
        next: (v) => portSteps(ports, ["port"], v) ?? (v.band ? null : bandStep(rules, "match", scenario, v)),
        run: () => undefined,
      },
      {
        id: "check.insertion_loss",
        title: "Run insertion loss check",
        group: "Checks",
        keywords: ["loss", "through"],
        next: (v) => portSteps(ports, ["from", "to"], v, rulePair(rules, ports, ["insertion_loss", "gain", "noise_figure", "headroom"])) ?? (v.band ? null : bandStep(rules, "insertion_loss", scenario, v)),
        run: () => undefined,
      },
    );
    // limits after the band
    const withLimit = (cmd: HelmCommand, kind: RuleKind, key: string, prompt: string, fallback: number) => {
      const first = cmd.next!;
      cmd.next = (v) => first(v) ?? (v[key] === undefined ? limitStep(kind, v, key, prompt, fallback) : null);
    };
    withLimit(commands[commands.length - 3], "isolation", "min_db", "Least isolation (dB)", 30);
    withLimit(commands[commands.length - 2], "match", "min_return_loss_db", "Least return loss (dB)", 10);
    withLimit(commands[commands.length - 1], "insertion_loss", "max_db", "Largest insertion loss (dB)", 3);
    commands[commands.length - 3].run = (v) => page.runCheck("isolation", { from: v.from, to: v.to, band: v.band, min_db: v.min_db });
    commands[commands.length - 2].run = (v) => page.runCheck("match", { port: v.port, band: v.band, min_return_loss_db: v.min_return_loss_db });
    commands[commands.length - 1].run = (v) => page.runCheck("insertion_loss", { from: v.from, to: v.to, band: v.band, max_db: v.max_db });

    const drive = rules.find((r) => r.kind === "drive");
    const [defFrom] = defaultPair(ports);
    commands.push(
      {
        id: "check.leak_trace",
        title: "Trace leak paths",
        group: "Checks",
        keywords: ["leak", "path", "coupling", "isolation"],
        next: (v) => portSteps(ports, ["from", "to"], v) ?? (v.band ? null : bandStep(rules, "isolation", scenario, v)),
        run: (v) => page.runCheck("leak_trace", { from: v.from, to: v.to, band: v.band }),
      },
      {
        id: "check.leak_trace_at",
        title: "Trace leak paths at a frequency…",
        group: "Checks",
        keywords: ["leak", "frequency"],
        next: (v) => {
          const step = portSteps(ports, ["from", "to"], v);
          if (step) return step;
          if (v.frequencyHz !== undefined) return null;
          const range = planRange(scenario);
          return { kind: "text", key: "frequencyHz", prompt: "Frequency", initial: range ? `${((range[0] + range[1]) / 2e9).toPrecision(4)} GHz` : "", parse: parseFrequency };
        },
        run: (v) => page.runCheck("leak_trace", { from: v.from, to: v.to, frequencyHz: v.frequencyHz }),
      },
      {
        id: "check.power_ledger",
        title: "Show power ledger",
        group: "Checks",
        keywords: ["power", "where", "absorbed", "budget"],
        next: (v) => portSteps(ports, ["port"], v),
        run: (v) => page.runCheck("power_ledger", { port: v.port }),
      },
      {
        id: "check.drive",
        title: "Check drive levels",
        group: "Checks",
        keywords: ["drive", "power", "rating", "dbm"],
        next: (v) =>
          v.sources !== undefined
            ? null
            : {
                kind: "text",
                key: "sources",
                prompt: "Source powers",
                initial: drive && drive.kind === "drive" ? drive.sources.map((s) => `${s.port} ${s.dbm} dBm`).join(", ") : `${defFrom} ${DEFAULT_DRIVE_DBM} dBm`,
                // the field starts with the level, so the person sees what would be driven before Enter
                hint:
                  drive && drive.kind === "drive"
                    ? "From the drive rule; e.g. TX 30 dBm, ANT-A 10 dBm"
                    : `No drive rule: ${DEFAULT_DRIVE_DBM} dBm assumed; check each part's rating before going above 30 dBm`,
                parse: (t) => parseSources(t, ports),
              },
        run: (v) => page.runCheck("drive", { sources: v.sources }),
      },
      { id: "check.state_sweep", title: "Sweep switch states", group: "Checks", keywords: ["switch", "combinations", "sweep"], run: () => page.runCheck("state_sweep", {}) },
      { id: "check.stability", title: "Check stability", group: "Checks", keywords: ["rollett", "k", "mu", "oscillation"], run: () => page.runCheck("stability", {}) },
      {
        id: "check.lineup",
        title: "Line-up: gain, noise figure and levels along a path…",
        group: "Checks",
        keywords: ["lineup", "line-up", "noise", "nf", "gain", "p1db", "ip3", "headroom", "cascade"],
        next: (v) =>
          portSteps(ports, ["from", "to"], v) ??
          (v.input_dbm === undefined
            ? { kind: "text", key: "input_dbm", prompt: "Input level (dBm, blank for none)", initial: "", hint: "e.g. -30 dBm", parse: parseOptionalDbm }
            : null),
        run: (v) => page.runCheck("lineup", { from: v.from, to: v.to, ...(typeof v.input_dbm === "number" ? { input_dbm: v.input_dbm } : {}) }),
      },
      {
        id: "check.spread",
        title: "Spread analysis…",
        group: "Checks",
        keywords: ["spread", "yield", "tolerance", "monte carlo", "sigma", "samples", "seed"],
        next: (v) =>
          v.samples === undefined
            ? { kind: "text", key: "samples", prompt: "Samples", initial: "500", hint: "1 to 20000", parse: parseSamples }
            : v.seed === undefined
              ? { kind: "text", key: "seed", prompt: "Seed (blank for a random one, stored with the run)", initial: "", hint: "e.g. 1", parse: parseSeed }
              : null,
        run: (v) => page.runCheck("spread", { samples: v.samples, ...(typeof v.seed === "number" ? { seed: v.seed } : {}) }),
      },
      { id: "check.all_rules", title: "Run all rules", group: "Checks", keywords: ["rules", "verdicts", "everything"], run: () => page.runCheck("all_rules", {}) },
    );
  }

  // --- actions (on a scenario page)
  if (page) {
    const scenario = page.scenario;
    if (allowed("scenario.edit")) {
      commands.push(
        {
          id: "action.add_block",
          title: "Add block…",
          group: "Actions",
          shortcut: ["A"],
          keywords: ["place", "new", "part"],
          next: (v) =>
            v.kind !== undefined
              ? null
              : {
                  kind: "choose",
                  key: "kind",
                  prompt: "Block kind or part",
                  options: [
                    ...ADDABLE_KINDS.map((k) => ({ value: k, label: kindTitle(k) })),
                    ...page.parts.map((p) => ({ value: `part:${p.id}`, label: p.name, hint: p.fileName })),
                  ],
                },
          run: (v) => {
            const kind = String(v.kind);
            if (kind.startsWith("part:")) {
              const part = page.parts.find((p) => `part:${p.id}` === kind);
              if (part) page.addBlock("touchstone", part as PartSummary);
            } else page.addBlock(kind as (typeof ADDABLE_KINDS)[number]);
          },
        },
        {
          id: "action.mark_port",
          title: "Mark system port…",
          group: "Actions",
          keywords: ["port", "expose", "name"],
          next: (v) => {
            if (v.at === undefined) {
              const used = new Set([...scenario.links.flat(), ...scenario.ports.map((p) => p.at)]);
              const free: HelmOption[] = [];
              for (const b of scenario.blocks) {
                const n = portCountOf(b, page.parts);
                for (let p = 1; p <= n; p++) if (!used.has(`${b.id}:${p}`)) free.push({ value: `${b.id}:${p}`, label: `${b.id}:${p}`, hint: kindTitle(b.kind) });
              }
              return { kind: "choose", key: "at", prompt: "Free block port", options: free };
            }
            if (v.name === undefined) {
              return {
                kind: "text",
                key: "name",
                prompt: "System port name",
                initial: nextSystemPortName(scenario),
                parse: (t) => (t.trim() === "" ? { ok: false, error: "Name the port." } : { ok: true, value: t.trim() }),
              };
            }
            return null;
          },
          run: (v) => page.markSystemPort(String(v.at), String(v.name)),
        },
        {
          id: "action.switch_state",
          title: "Set switch state…",
          group: "Actions",
          keywords: ["throw", "switch", "state"],
          next: (v) => {
            const switches = scenario.blocks.filter((b) => b.kind === "switch");
            if (v.block === undefined) return { kind: "choose", key: "block", prompt: "Switch", options: switches.map((b) => ({ value: b.id, label: b.id, hint: `now throw ${b.state ?? 1}` })) };
            if (v.state === undefined) {
              const block = switches.find((b) => b.id === v.block);
              const throws = block ? switchThrows(block) : 0;
              return {
                kind: "choose",
                key: "state",
                prompt: `State of ${String(v.block)}`,
                options: Array.from({ length: throws }, (_, i) => ({ value: String(i + 1), label: `Throw ${i + 1} (common to port ${i + 2})`, hint: (block?.state ?? 1) === i + 1 ? "current" : undefined })),
              };
            }
            return null;
          },
          run: (v) => page.setSwitchState(String(v.block), Number(v.state)),
        },
        { id: "action.save", title: "Save revision", group: "Actions", keywords: ["save", "store"], run: () => page.saveRevision() },
      );
    }
    if (allowed("scenario.create")) commands.push({ id: "action.duplicate", title: "Duplicate scenario", group: "Actions", keywords: ["copy", "clone"], run: () => page.duplicateScenario() });
    commands.push({ id: "action.touchstone", title: "Download composite Touchstone", group: "Actions", keywords: ["export", "snp", "file"], run: () => page.downloadTouchstone() });
    if (allowed("bundle.export")) commands.push({ id: "action.bundle", title: "Export review bundle", group: "Actions", keywords: ["zip", "archive", "review"], run: () => page.exportBundle() });
  }

  // --- navigation
  commands.push({ id: "nav.projects", title: "Open the projects list", group: "Navigation", keywords: ["home", "all projects"], run: () => navigate("/projects") });
  if (projects.length > 0) {
    commands.push({
      id: "nav.project",
      title: "Go to project…",
      group: "Navigation",
      next: (v) => (v.project !== undefined ? null : { kind: "choose", key: "project", prompt: "Project", options: projects.map((p) => ({ value: p.id, label: p.name, hint: p.role })) }),
      run: (v) => navigate(`/projects/${String(v.project)}`),
    });
  }
  if (base) {
    commands.push(
      { id: "nav.scenarios", title: "Go to scenarios", group: "Navigation", run: () => navigate(`${base}/scenarios`) },
      { id: "nav.parts", title: "Go to parts", group: "Navigation", run: () => navigate(`${base}/parts`) },
      { id: "nav.rules", title: "Go to rules", group: "Navigation", run: () => navigate(`${base}/rules`) },
      { id: "nav.members", title: "Go to members", group: "Navigation", run: () => navigate(`${base}/members`) },
    );
    if (scenarios.length >= 2) {
      commands.push({
        id: "nav.compare",
        title: "Compare scenarios…",
        group: "Navigation",
        keywords: ["diff", "side by side", "versus"],
        next: (v) => {
          const options = scenarios.map((s) => ({ value: s.id, label: s.name }));
          if (v.a === undefined) {
            const first = page ? options.findIndex((o) => o.value === page.scenarioId) : -1;
            return { kind: "choose", key: "a", prompt: "First scenario", options: first > 0 ? [options[first], ...options.filter((_, i) => i !== first)] : options };
          }
          if (v.b === undefined) return { kind: "choose", key: "b", prompt: "Second scenario", options: options.filter((o) => o.value !== v.a) };
          return null;
        },
        run: (v) => navigate(`${base}/compare?a=${encodeURIComponent(String(v.a))}&b=${encodeURIComponent(String(v.b))}`),
      });
    }
    for (const s of scenarios) commands.push({ id: `nav.scenario.${s.id}`, title: `Open scenario ${s.name}`, group: "Navigation", keywords: ["scenario"], run: () => navigate(`${base}/scenarios/${s.id}`) });
    for (const p of parts) commands.push({ id: `nav.part.${p.id}`, title: `Open part ${p.name}`, group: "Navigation", keywords: ["part", p.fileName], run: () => navigate(`${base}/parts#part-${p.id}`) });
    for (const r of data.rules) if (r.id) commands.push({ id: `nav.rule.${r.id}`, title: `Open rule ${r.id}`, group: "Navigation", keywords: ["rule", r.kind], run: () => navigate(`${base}/rules#rule-${r.id}`) });
  }
  return commands;
}
