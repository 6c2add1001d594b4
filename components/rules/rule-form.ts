import { z } from "zod";
import type { RuleSpec } from "@/engine/types";
import { formatBand, parseBand, parseDb, parseSources } from "@/components/helm/parse-input";
import { RULE_KINDS, ruleSpecSchema } from "@/lib/domain/rules/schema";

/** The rules form as typed: text fields, with units allowed in bands ("2.4 GHz to 2.48 GHz") and powers. */
export type RuleFormValues = {
  id: string;
  kind: (typeof RULE_KINDS)[number];
  from: string;
  to: string;
  port: string;
  band: string;
  /** isolation: least dB; insertion loss, noise figure: largest dB; match: least return loss dB (or VSWR, see
   *  matchBy); gain: least dB (optional with limitMax); headroom: least dB */
  limit: string;
  /** gain: largest dB (optional with limit) */
  limitMax: string;
  /** headroom: the input level, dBm */
  inputDbm: string;
  matchBy: "return_loss" | "vswr";
  oneWay: boolean;
  sources: string;
  coherent: boolean;
};

export const EMPTY_RULE_FORM: RuleFormValues = {
  id: "",
  kind: "isolation",
  from: "TX",
  to: "RX",
  port: "TX",
  band: "",
  limit: "",
  limitMax: "",
  inputDbm: "",
  matchBy: "return_loss",
  oneWay: false,
  sources: "",
  coherent: false,
};

/** The form values that show an existing rule (of a kind the form edits). */
export function formFromSpec(spec: Extract<RuleSpec, { kind: RuleFormValues["kind"] }>): RuleFormValues {
  const v: RuleFormValues = { ...EMPTY_RULE_FORM, id: spec.id ?? "", kind: spec.kind };
  if ("band" in spec && spec.band) v.band = formatBand(spec.band);
  switch (spec.kind) {
    case "isolation":
      return { ...v, from: spec.from, to: spec.to, limit: String(spec.min_db), oneWay: spec.one_way ?? false };
    case "insertion_loss":
      return { ...v, from: spec.from, to: spec.to, limit: String(spec.max_db) };
    case "match":
      return spec.min_return_loss_db !== undefined
        ? { ...v, port: spec.port, matchBy: "return_loss", limit: String(spec.min_return_loss_db) }
        : { ...v, port: spec.port, matchBy: "vswr", limit: String(spec.max_vswr ?? "") };
    case "drive":
      return { ...v, sources: spec.sources.map((s) => `${s.port} ${s.dbm} dBm`).join(", "), coherent: spec.coherent ?? false };
    case "noise_figure":
      return { ...v, from: spec.from, to: spec.to, limit: String(spec.max_db) };
    case "gain":
      return { ...v, from: spec.from, to: spec.to, limit: spec.min_db === undefined ? "" : String(spec.min_db), limitMax: spec.max_db === undefined ? "" : String(spec.max_db) };
    case "headroom":
      return { ...v, from: spec.from, to: spec.to, limit: String(spec.min_db), inputDbm: String(spec.input_dbm) };
  }
}

/** Turns form values into a rule spec, or per-field messages. */
export function specFromForm(v: RuleFormValues): { ok: true; spec: RuleSpec } | { ok: false; fields: Partial<Record<keyof RuleFormValues, string>> } {
  const fields: Partial<Record<keyof RuleFormValues, string>> = {};
  let band: [number, number] | undefined;
  if (v.band.trim() !== "" || (v.kind !== "drive" && v.kind !== "headroom")) {
    const b = parseBand(v.band);
    if (b.ok) band = b.value;
    else fields.band = b.error;
  }
  let limit: number | undefined;
  if (v.kind !== "drive" && !(v.kind === "gain" && v.limit.trim() === "")) {
    const l = parseDb(v.limit);
    if (l.ok) limit = l.value;
    else fields.limit = v.limit.trim() === "" ? "Enter the limit." : l.error;
  }
  let limitMax: number | undefined;
  if (v.kind === "gain" && v.limitMax.trim() !== "") {
    const l = parseDb(v.limitMax);
    if (l.ok) limitMax = l.value;
    else fields.limitMax = l.error;
  }
  if (v.kind === "gain" && v.limit.trim() === "" && v.limitMax.trim() === "") fields.limit = "Give a least gain or a largest gain.";
  let inputDbm: number | undefined;
  if (v.kind === "headroom") {
    const l = parseDb(v.inputDbm.replace(/m\s*$/i, ""));
    if (l.ok) inputDbm = l.value;
    else fields.inputDbm = v.inputDbm.trim() === "" ? "Enter the input level." : "Enter a level in dBm.";
  }
  let sources: { port: string; dbm: number }[] | undefined;
  if (v.kind === "drive") {
    const s = parseSources(v.sources, null);
    if (s.ok) sources = s.value;
    else fields.sources = s.error;
  }
  if (Object.keys(fields).length > 0) return { ok: false, fields };
  const raw =
    v.kind === "isolation"
      ? { kind: v.kind, id: v.id, from: v.from, to: v.to, band, min_db: limit, ...(v.oneWay ? { one_way: true } : {}) }
      : v.kind === "insertion_loss"
        ? { kind: v.kind, id: v.id, from: v.from, to: v.to, band, max_db: limit }
        : v.kind === "match"
          ? { kind: v.kind, id: v.id, port: v.port, band, ...(v.matchBy === "vswr" ? { max_vswr: limit } : { min_return_loss_db: limit }) }
          : v.kind === "drive"
            ? { kind: v.kind, id: v.id, sources, ...(band ? { band } : {}), ...(v.coherent ? { coherent: true } : {}) }
            : v.kind === "noise_figure"
              ? { kind: v.kind, id: v.id, from: v.from, to: v.to, band, max_db: limit }
              : v.kind === "gain"
                ? { kind: v.kind, id: v.id, from: v.from, to: v.to, band, ...(limit !== undefined ? { min_db: limit } : {}), ...(limitMax !== undefined ? { max_db: limitMax } : {}) }
                : { kind: v.kind, id: v.id, from: v.from, to: v.to, input_dbm: inputDbm, min_db: limit, ...(band ? { band } : {}) };
  const parsed = ruleSpecSchema.safeParse(raw);
  if (parsed.success) return { ok: true, spec: parsed.data };
  for (const issue of parsed.error.issues) {
    const key = String(issue.path[0] ?? "id");
    const map: Record<string, keyof RuleFormValues> = { min_db: "limit", max_db: v.kind === "gain" ? "limitMax" : "limit", min_return_loss_db: "limit", max_vswr: "limit", input_dbm: "inputDbm" };
    const field = (map[key] ?? (key in EMPTY_RULE_FORM ? key : "id")) as keyof RuleFormValues;
    fields[field] ??= issue.message;
  }
  return { ok: false, fields };
}

/** The zod schema react-hook-form validates with: the same conversion, reported per field. */
export const ruleFormSchema = z
  .object({
    id: z.string(),
    kind: z.enum(RULE_KINDS),
    from: z.string(),
    to: z.string(),
    port: z.string(),
    band: z.string(),
    limit: z.string(),
    limitMax: z.string(),
    inputDbm: z.string(),
    matchBy: z.enum(["return_loss", "vswr"]),
    oneWay: z.boolean(),
    sources: z.string(),
    coherent: z.boolean(),
  })
  .superRefine((v, ctx) => {
    const r = specFromForm(v);
    if (r.ok) return;
    for (const [path, message] of Object.entries(r.fields)) ctx.addIssue({ code: "custom", path: [path], message });
  });
