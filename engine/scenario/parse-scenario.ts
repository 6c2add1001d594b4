/**
 * Reading a scenario file: the zod schema for its structure, then the references between its parts
 * (block ids, link endpoints, system ports, rules), each error with the JSON path where it was found.
 */
import { evaluateBlock } from "../blocks";
import { blockSpreadParams } from "../spread/spec";
import { loadPart, type PartSource } from "../system/parts";
import { EngineInputError, type BlockSpec, type FrequencyPlanSpec, type Scenario } from "../types";
import { frequencyPlan } from "./frequency-plan";
import { formatJsonPath } from "./json-path";
import { placeBlockError } from "./block-errors";
import { FrequencyListSchema, FrequencyRangeSchema, ScenarioSchema } from "./schema";
import { describeIssue } from "./zod-messages";
import type { z } from "zod";

/** The format string every scenario file carries. */
export const SCENARIO_FORMAT = "portolan.scenario/1";

function firstIssue(error: z.ZodError, root: unknown, prefix: PropertyKey[] = []): EngineInputError {
  const issue = error.issues[0];
  const where = formatJsonPath([...prefix, ...issue.path]);
  return new EngineInputError(where, describeIssue(issue, prefix.length === 0 ? root : valueAtPrefix(root, prefix)));
}

function valueAtPrefix(root: unknown, prefix: PropertyKey[]): unknown {
  let at = root;
  for (const key of prefix) at = (at as Record<PropertyKey, unknown>)[key as string];
  return at;
}

/** Splits "BLOCK:PORT" into its block id and 1-based port. */
export function splitPortRef(ref: string): { block: string; port: number } {
  const colon = ref.lastIndexOf(":");
  return { block: ref.slice(0, colon), port: Number(ref.slice(colon + 1)) };
}

// one frequency is enough to let the model check every parameter (names, types, ranges, combinations)
const PROBE_HZ = Float64Array.of(1e9);

/** Validates a built-in block by evaluating its model at one frequency; returns its port count. */
function probeBuiltIn(block: BlockSpec, where: string): number {
  try {
    return evaluateBlock(block, PROBE_HZ, 50).s.n;
  } catch (err) {
    throw placeBlockError(where, block.id, err);
  }
}

/**
 * Port count of a block: built-in kinds from their parameters; touchstone parts from their data when
 * it can be read (inline, `parts`, `readFile`), else from the `ports` hint or a ".sNp" file name.
 *
 * @returns the count, or undefined when a part file cannot be read from here
 */
function portCountOf(block: BlockSpec, where: string, source: PartSource): number | undefined {
  if (block.kind !== "touchstone") return probeBuiltIn(block, where);
  const part = loadPart(block, where, source);
  if (part) return part.ports;
  if (block.ports !== undefined) return block.ports;
  const m = /\.s(\d+)p$/i.exec(block.file ?? "");
  return m ? Number(m[1]) : undefined;
}

function checkBlocks(scenario: Scenario, source: PartSource): Map<string, { index: number; ports: number | undefined }> {
  const byId = new Map<string, { index: number; ports: number | undefined }>();
  scenario.blocks.forEach((block, i) => {
    const where = `blocks[${i}]`;
    const earlier = byId.get(block.id);
    if (earlier) throw new EngineInputError(`${where}.id`, `duplicate block id "${block.id}" (also blocks[${earlier.index}])`);
    if (block.kind === "touchstone") {
      if (block.data === undefined && block.file === undefined) {
        throw new EngineInputError(where, "a touchstone block needs `file` or inline `data`");
      }
      if (block.params !== undefined && Object.keys(block.params).length > 0) {
        throw new EngineInputError(`${where}.params`, "a touchstone block takes no parameters: its data is the part");
      }
      if (block.part_version !== undefined && block.file === undefined) {
        throw new EngineInputError(`${where}.part_version`, "a part version pins a library part named by `file`; this block has inline `data` only");
      }
    } else {
      if (block.file !== undefined || block.data !== undefined) {
        throw new EngineInputError(block.file !== undefined ? `${where}.file` : `${where}.data`, `only touchstone blocks take part data; this block is a ${block.kind}`);
      }
      if (block.part_version !== undefined) {
        throw new EngineInputError(`${where}.part_version`, `only touchstone blocks pin a part version; this block is a ${block.kind}`);
      }
    }
    if (block.active !== undefined && block.kind !== "touchstone" && block.active !== (block.kind === "amplifier")) {
      throw new EngineInputError(
        `${where}.active`,
        block.kind === "amplifier"
          ? "an amplifier is active by its model; `active: false` applies to measured parts (touchstone)"
          : `a ${block.kind} is passive by its model; \`active: true\` marks measured parts (touchstone), and the amplifier is active by its model`,
      );
    }
    if (block.state !== undefined && block.kind !== "switch") {
      throw new EngineInputError(`${where}.state`, `only switch blocks have a state; this block is a ${block.kind}`);
    }
    const ports = portCountOf(block, where, source);
    blockSpreadParams(block, i);
    if (block.kind === "switch" && block.state !== undefined && ports !== undefined && block.state > ports - 1) {
      throw new EngineInputError(`${where}.state`, `expected a throw from 1 to ${ports - 1}, got ${block.state}`);
    }
    byId.set(block.id, { index: i, ports });
  });
  return byId;
}

function resolveRef(
  ref: string,
  where: string,
  byId: Map<string, { index: number; ports: number | undefined }>,
): { block: string; port: number } {
  const { block, port } = splitPortRef(ref);
  const found = byId.get(block);
  if (!found) throw new EngineInputError(where, `no block with id "${block}" (in "${ref}")`);
  if (found.ports !== undefined && port > found.ports) {
    throw new EngineInputError(
      where,
      `block ${block} has ${found.ports} port${found.ports === 1 ? "" : "s"}; there is no port ${port} (in "${ref}")`,
    );
  }
  return { block, port };
}

function checkReferences(scenario: Scenario, byId: Map<string, { index: number; ports: number | undefined }>): void {
  const usedAt = new Map<string, string>();
  scenario.links.forEach((link, i) => {
    const ends = link.map((ref, j) => {
      const where = `links[${i}][${j}]`;
      const { block, port } = resolveRef(ref, where, byId);
      const key = `${block}:${port}`;
      const earlier = usedAt.get(key);
      if (earlier) throw new EngineInputError(where, `port ${key} is linked twice (also ${earlier})`);
      usedAt.set(key, where);
      return key;
    });
    if (ends[0] === ends[1]) throw new EngineInputError(`links[${i}]`, `a link joins two different ports; both ends are ${ends[0]}`);
  });
  const names = new Map<string, number>();
  scenario.ports.forEach((sp, i) => {
    const earlierName = names.get(sp.name);
    if (earlierName !== undefined) throw new EngineInputError(`ports[${i}].name`, `duplicate system port name "${sp.name}" (also ports[${earlierName}])`);
    names.set(sp.name, i);
    const where = `ports[${i}].at`;
    const { block, port } = resolveRef(sp.at, where, byId);
    const key = `${block}:${port}`;
    const earlier = usedAt.get(key);
    if (earlier) {
      const what = earlier.startsWith("links") ? `is linked (${earlier}); a system port must be a free block port` : `is already system port ${earlier}`;
      throw new EngineInputError(where, `port ${key} ${what}`);
    }
    usedAt.set(key, `ports[${i}]`);
  });
  (scenario.rules ?? []).forEach((rule, i) => {
    const refs: [string, string][] =
      rule.kind === "match"
        ? [[`rules[${i}].port`, rule.port]]
        : rule.kind === "drive"
          ? rule.sources.map((s, k) => [`rules[${i}].sources[${k}].port`, s.port] as [string, string])
          : [
              [`rules[${i}].from`, rule.from],
              [`rules[${i}].to`, rule.to],
            ];
    for (const [where, name] of refs) {
      if (!names.has(name)) {
        throw new EngineInputError(where, `no system port named "${name}" (system ports: ${[...names.keys()].join(", ")})`);
      }
    }
    if ("band" in rule && rule.band !== undefined && !(rule.band[1] >= rule.band[0])) {
      throw new EngineInputError(`rules[${i}].band`, `expected [low, high] in Hz with high ≥ low, got [${rule.band.join(", ")}]`);
    }
    if (rule.kind === "match" && rule.min_return_loss_db === undefined && rule.max_vswr === undefined) {
      throw new EngineInputError(`rules[${i}]`, "a match rule needs min_return_loss_db or max_vswr");
    }
  });
}

/**
 * Validates a scenario (the parsed JSON of a scenario file) and returns it typed.
 *
 * Checks, in order: the structure (zod schema; format must be "portolan.scenario/1"), the frequency
 * plan, block ids unique, block parameters (each built-in model evaluated at one probe frequency, so
 * that its own checks of names, types, ranges and combinations apply), switch states, link
 * endpoints ("ID:PORT" naming an existing block and one of its ports; no port linked twice), system
 * ports (names unique; each at a free block port, used once), spreads (engine/spread/spec.ts) and rules (naming existing system ports).
 * Port counts of touchstone parts come from their data when it can be read (inline `data`, `parts`,
 * `readFile`), otherwise from `ports` or the ".sNp" name; prepareSystem checks again once it has the data.
 *
 * @param input - the parsed JSON
 * @param source - optional access to part files, so that their port counts can be checked here
 * @returns the scenario (unknown fields dropped)
 * @throws EngineInputError whose `where` is the JSON path (e.g. `blocks[2].params.loss_db`, `links[3][1]`)
 * @example
 * const scenario = parseScenario(JSON.parse(readFileSync("front-end.json", "utf8")));
 */
export function parseScenario(input: unknown, source: PartSource = {}): Scenario {
  if (input === null || typeof input !== "object" || Array.isArray(input)) {
    throw new EngineInputError("(root)", "expected a JSON object with format \"portolan.scenario/1\"");
  }
  const format = (input as Record<string, unknown>).format;
  if (format !== SCENARIO_FORMAT) {
    throw new EngineInputError("format", `expected "${SCENARIO_FORMAT}", got ${format === undefined ? "nothing" : JSON.stringify(format)}`);
  }
  const parsed = ScenarioSchema.safeParse(input);
  if (!parsed.success) throw firstIssue(parsed.error, input);
  const rawPlan = parsed.data.frequency;
  const planSchema = "list" in rawPlan ? FrequencyListSchema : FrequencyRangeSchema;
  const plan = planSchema.safeParse(rawPlan);
  if (!plan.success) throw firstIssue(plan.error, input, ["frequency"]);
  const scenario = { ...parsed.data, frequency: plan.data as FrequencyPlanSpec } as Scenario;
  frequencyPlan(scenario.frequency);
  const byId = checkBlocks(scenario, source);
  checkReferences(scenario, byId);
  return scenario;
}

/**
 * Parses the text of a scenario file: JSON syntax errors are reported with line and column.
 *
 * @param text - the file's text
 * @param source - optional access to part files (see parseScenario)
 * @returns the validated scenario
 * @throws EngineInputError with `where` = "line 3, column 14" for bad JSON, or a JSON path
 * @example
 * parseScenarioText('{"format": "portolan.scenario/1", ...}');
 */
export function parseScenarioText(text: string, source: PartSource = {}): Scenario {
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (err) {
    const message = err instanceof Error ? err.message : String(err);
    const { line, column } = jsonErrorPosition(text, message);
    const reason = message.replace(/\s*\(line \d+ column \d+\)/, "").replace(/ in JSON at position \d+.*$/, "");
    throw new EngineInputError(`line ${line}, column ${column}`, `invalid JSON: ${reason}`);
  }
  return parseScenario(json, source);
}

function jsonErrorPosition(text: string, message: string): { line: number; column: number } {
  const lc = /line (\d+) column (\d+)/.exec(message);
  if (lc) return { line: Number(lc[1]), column: Number(lc[2]) };
  const pos = /position (\d+)/.exec(message);
  const offset = pos ? Number(pos[1]) : text.length;
  let line = 1;
  let lineStart = 0;
  for (let i = 0; i < offset && i < text.length; i++) {
    if (text.charCodeAt(i) === 10) {
      line++;
      lineStart = i + 1;
    }
  }
  return { line, column: offset - lineStart + 1 };
}
