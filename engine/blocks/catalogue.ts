/**
 * The built-in block kinds as the web inspector shows them: titles, documented port numbering and
 * parameter declarations (units, defaults, ranges). The same declarations drive validation, so the
 * inspector and the engine cannot disagree about what a parameter means.
 */
import type { BlockKind } from "../types";
import type { ParamInfo } from "./params";

/** One built-in kind in the catalogue. */
export type BlockCatalogueEntry = {
  title: string;
  summary: string;
  /** fixed port count, or "param" when a parameter decides it (switch: throws + 1, array: elements) */
  ports: number | "param";
  /** labels of ports 1…n; never throws (a missing or invalid count gives the labels of the smallest legal count) */
  portLabels(params: Record<string, unknown> | undefined): string[];
  params: ParamInfo[];
};

/** Built-in kinds handled by engine/blocks (touchstone parts are read elsewhere). */
export type BuiltInBlockKind = Exclude<BlockKind, "touchstone">;

function countParam(params: Record<string, unknown> | undefined, name: string, min: number, max: number): number {
  const v = params?.[name];
  return typeof v === "number" && Number.isInteger(v) && v >= min && v <= max ? v : min;
}

const fixed = (...labels: string[]) => () => labels.slice();

const returnLoss = (help: string): ParamInfo => ({
  name: "return_loss_db",
  label: "Return loss",
  unit: "dB",
  kind: "number",
  default: null,
  required: false,
  min: 0,
  infinite: true,
  help,
});

const excessLoss: ParamInfo = {
  name: "excess_loss_db",
  label: "Excess loss",
  unit: "dB",
  kind: "number",
  default: 0,
  required: false,
  min: 0,
  help: "Dissipative loss on top of the ideal split, applied to every transmission path.",
};

const isolationOptional = (help: string): ParamInfo => ({
  name: "isolation_db",
  label: "Isolation",
  unit: "dB",
  kind: "number",
  default: null,
  required: false,
  min: 0,
  infinite: true,
  help,
});

const oneportParams = (what: string): ParamInfo[] => [
  {
    name: "return_loss_db",
    label: "Return loss",
    unit: "dB",
    kind: "number",
    required: false,
    min: 0,
    infinite: true,
    suggested: 20,
    help: `Reflection magnitude of the ${what}: |Γ| = 10^(−RL/20); null means matched. Give this or impedance.`,
  },
  {
    name: "phase_deg",
    label: "Reflection phase",
    unit: "deg",
    kind: "number",
    default: 0,
    required: false,
    help: "Angle of Γ in degrees (with return_loss_db only).",
  },
  {
    name: "impedance",
    label: "Impedance",
    unit: "Ω",
    kind: "complex",
    required: false,
    min: 0,
    help: `Impedance of the ${what} as [re, im] Ω; Γ = (Z − Z0)/(Z + Z0) with the system Z0. Give this or return_loss_db.`,
  },
];

const filterParams: ParamInfo[] = [
  {
    name: "response",
    label: "Response",
    unit: "",
    kind: "enum",
    required: true,
    options: ["lowpass", "highpass", "bandpass", "bandstop"],
    suggested: "bandpass",
    help: "Which frequency transformation of the low-pass prototype to apply.",
  },
  {
    name: "family",
    label: "Family",
    unit: "",
    kind: "enum",
    required: true,
    options: ["butterworth", "chebyshev"],
    suggested: "chebyshev",
    help: "Maximally flat (Butterworth) or equal-ripple (Chebyshev) prototype.",
  },
  {
    name: "order",
    label: "Order",
    unit: "",
    kind: "integer",
    required: true,
    min: 1,
    max: 15,
    suggested: 5,
    help: "Number of reactive elements of the low-pass prototype (resonators for band-pass/band-stop).",
  },
  {
    name: "ripple_db",
    label: "Passband ripple",
    unit: "dB",
    kind: "number",
    default: 0.5,
    required: false,
    min: 0,
    minExclusive: true,
    max: 20,
    help: "Chebyshev only: the passband ripple, also the loss at the band edges.",
  },
  {
    name: "cutoff_hz",
    label: "Cutoff",
    unit: "Hz",
    kind: "number",
    required: false,
    min: 0,
    minExclusive: true,
    help: "Low-pass/high-pass: band edge (3 dB for Butterworth, ripple_db for Chebyshev).",
  },
  {
    name: "center_hz",
    label: "Centre",
    unit: "Hz",
    kind: "number",
    required: false,
    min: 0,
    minExclusive: true,
    help: "Band-pass/band-stop: geometric centre √(f1·f2) of the band edges.",
  },
  {
    name: "bandwidth_hz",
    label: "Bandwidth",
    unit: "Hz",
    kind: "number",
    required: false,
    min: 0,
    minExclusive: true,
    help: "Band-pass/band-stop: f2 − f1 between the band edges.",
  },
];

/**
 * Every built-in kind with its documented port numbering and parameters.
 *
 * @example
 * BLOCK_CATALOGUE.coupler.portLabels({}); // ["input", "through", "coupled", "isolated"]
 */
export const BLOCK_CATALOGUE: Record<BuiltInBlockKind, BlockCatalogueEntry> = {
  load: {
    title: "Load",
    summary: "One-port termination given by its return loss and phase, or by its impedance.",
    ports: 1,
    portLabels: fixed("termination"),
    params: oneportParams("load"),
  },
  antenna: {
    title: "Antenna",
    summary: "One-port radiator: what it does not reflect is counted as radiated.",
    ports: 1,
    portLabels: fixed("feed"),
    params: [
      ...oneportParams("antenna feed"),
      {
        name: "noise_temperature_k",
        label: "Noise temperature",
        unit: "K",
        kind: "number",
        default: 290,
        required: false,
        min: 0,
        help: "Antenna noise temperature: its feed is noisy like a passive one-port at this temperature.",
      },
    ],
  },
  attenuator: {
    title: "Attenuator",
    summary: "Matched, reciprocal fixed attenuator with real transmission 10^(−L/20).",
    ports: 2,
    portLabels: fixed("1", "2"),
    params: [
      { name: "loss_db", label: "Loss", unit: "dB", kind: "number", required: true, min: 0, suggested: 3, help: "Attenuation between the ports." },
    ],
  },
  line: {
    title: "Line",
    summary: "Transmission-line section (cable, trace); may differ from the system Z0.",
    ports: 2,
    portLabels: fixed("1", "2"),
    params: [
      { name: "length_m", label: "Length", unit: "m", kind: "number", required: true, min: 0, suggested: 0.1, help: "Physical length." },
      {
        name: "velocity_factor",
        label: "Velocity factor",
        unit: "",
        kind: "number",
        default: 1,
        required: false,
        min: 0,
        minExclusive: true,
        max: 1,
        help: "Phase velocity over the speed of light in vacuum (0 < v ≤ 1).",
      },
      {
        name: "loss_db_per_m",
        label: "Loss per metre",
        unit: "dB/m",
        kind: "number",
        default: 0,
        required: false,
        min: 0,
        help: "Matched loss per metre, taken as constant over frequency.",
      },
      {
        name: "impedance",
        label: "Characteristic impedance",
        unit: "Ω",
        kind: "number",
        required: false,
        min: 0,
        minExclusive: true,
        help: "Real characteristic impedance; omitted means the system Z0 (a matched line).",
      },
    ],
  },
  phase_shifter: {
    title: "Phase shifter",
    summary: "Matched, reciprocal phase shift with optional loss: S21 = 10^(−L/20)·e^(−jφ).",
    ports: 2,
    portLabels: fixed("1", "2"),
    params: [
      { name: "phase_deg", label: "Phase shift", unit: "deg", kind: "number", required: true, suggested: 90, help: "Phase delay φ (positive delays)." },
      { name: "loss_db", label: "Loss", unit: "dB", kind: "number", default: 0, required: false, min: 0, help: "Insertion loss." },
    ],
  },
  isolator: {
    title: "Isolator",
    summary: "Non-reciprocal two-port: passes 1→2, blocks 2→1.",
    ports: 2,
    portLabels: fixed("input", "output"),
    params: [
      { name: "insertion_loss_db", label: "Insertion loss", unit: "dB", kind: "number", required: true, min: 0, suggested: 0.5, help: "Loss in the forward direction 1→2." },
      { name: "isolation_db", label: "Isolation", unit: "dB", kind: "number", required: true, min: 0, infinite: true, suggested: 20, help: "Loss in the reverse direction 2→1; null means ∞." },
      returnLoss("Return loss of both ports; null means matched."),
    ],
  },
  amplifier: {
    title: "Amplifier",
    summary: "Active two-port (1 in, 2 out) with gain, reverse isolation and port match.",
    ports: 2,
    portLabels: fixed("input", "output"),
    params: [
      { name: "gain_db", label: "Gain", unit: "dB", kind: "number", required: true, min: -200, max: 200, suggested: 20, help: "Forward gain |S21| in dB." },
      {
        name: "reverse_isolation_db",
        label: "Reverse isolation",
        unit: "dB",
        kind: "number",
        required: true,
        min: 0,
        infinite: true,
        suggested: 40,
        help: "Loss from output to input, |S12| = 10^(−ISO/20); null means ∞.",
      },
      { ...returnLoss("Input return loss; null means matched."), name: "input_return_loss_db", label: "Input return loss" },
      { ...returnLoss("Output return loss; null means matched."), name: "output_return_loss_db", label: "Output return loss" },
      {
        name: "noise_figure_db",
        label: "Noise figure",
        unit: "dB",
        kind: "number",
        required: false,
        min: 0,
        max: 100,
        help: "Noise figure from a Z0 source (matched-source figure); omitted means noiseless.",
      },
    ],
  },
  filter: {
    title: "Filter",
    summary: "Lossless LC ladder synthesised from a Butterworth or Chebyshev low-pass prototype.",
    ports: 2,
    portLabels: fixed("1", "2"),
    params: filterParams,
  },
  splitter: {
    title: "Splitter",
    summary: "Equal-split Wilkinson divider/combiner (1 common, 2 and 3 split).",
    ports: 3,
    portLabels: fixed("common", "split 1", "split 2"),
    params: [excessLoss, isolationOptional("Isolation between the split ports 2 and 3; null means ∞.")],
  },
  tee: {
    title: "Tee",
    summary: "Ideal lossless junction of three equal lines (no parameters).",
    ports: 3,
    portLabels: fixed("arm 1", "arm 2", "arm 3"),
    params: [],
  },
  circulator: {
    title: "Circulator",
    summary: "Three-port circulator, power flows 1→2→3→1.",
    ports: 3,
    portLabels: fixed("1 (→2)", "2 (→3)", "3 (→1)"),
    params: [
      { name: "insertion_loss_db", label: "Insertion loss", unit: "dB", kind: "number", default: 0, required: false, min: 0, help: "Loss along the direction of circulation." },
      isolationOptional("Loss against the direction of circulation; null means ∞."),
      returnLoss("Return loss of every port; null means matched."),
    ],
  },
  coupler: {
    title: "Directional coupler",
    summary: "Four-port coupler (1 in, 2 through, 3 coupled, 4 isolated).",
    ports: 4,
    portLabels: fixed("input", "through", "coupled", "isolated"),
    params: [
      { name: "coupling_db", label: "Coupling", unit: "dB", kind: "number", required: true, min: 0, minExclusive: true, suggested: 20, help: "Coupling factor C: |S31| = 10^(−C/20)." },
      {
        name: "directivity_db",
        label: "Directivity",
        unit: "dB",
        kind: "number",
        default: null,
        required: false,
        min: 0,
        infinite: true,
        help: "Directivity D: isolated-port leakage |S41| = 10^(−(C+D)/20); null means ∞.",
      },
      { ...excessLoss, help: "Dissipative loss applied to the through and coupled paths." },
    ],
  },
  hybrid90: {
    title: "90° hybrid",
    summary: "Quadrature 3 dB hybrid (1 in, 2 through −90°, 3 coupled −180°, 4 isolated).",
    ports: 4,
    portLabels: fixed("input", "through (−90°)", "coupled (−180°)", "isolated"),
    params: [excessLoss, isolationOptional("Leakage 1↔4 and 2↔3; null means ∞.")],
  },
  hybrid180: {
    title: "180° hybrid",
    summary: "Rat-race 3 dB hybrid (1 Σ input, 4 Δ input, 2 and 3 outputs).",
    ports: 4,
    portLabels: fixed("Σ input", "output 1", "output 2", "Δ input"),
    params: [excessLoss, isolationOptional("Leakage 1↔4 and 2↔3; null means ∞.")],
  },
  switch: {
    title: "Switch",
    summary: "Single-pole n-throw switch (1 common, 2…n+1 throws); the block's state picks the throw.",
    ports: "param",
    portLabels: (params) => {
      const n = countParam(params, "throws", 1, 16);
      return ["common", ...Array.from({ length: n }, (_, k) => `throw ${k + 1}`)];
    },
    params: [
      { name: "throws", label: "Throws", unit: "", kind: "integer", required: true, min: 1, max: 16, suggested: 2, help: "Number of throws n; the switch has n + 1 ports." },
      { name: "insertion_loss_db", label: "Insertion loss", unit: "dB", kind: "number", required: true, min: 0, suggested: 0.5, help: "Loss from the common port to the selected throw." },
      {
        name: "isolation_db",
        label: "Isolation",
        unit: "dB",
        kind: "number",
        required: true,
        min: 0,
        infinite: true,
        suggested: 30,
        help: "Loss from the common port to each unselected throw (twice that between two unselected throws); null means ∞.",
      },
      {
        name: "off_state",
        label: "Off state",
        unit: "",
        kind: "enum",
        default: "absorptive",
        required: false,
        options: ["absorptive", "reflective"],
        help: "Unselected throws are matched (absorptive) or reflect what does not leak (reflective).",
      },
    ],
  },
  array: {
    title: "Antenna array",
    summary: "n radiating elements on a line with mutual coupling that falls off with distance.",
    ports: "param",
    portLabels: (params) => {
      const n = countParam(params, "elements", 1, 256);
      return Array.from({ length: n }, (_, k) => `element ${k + 1}`);
    },
    params: [
      { name: "elements", label: "Elements", unit: "", kind: "integer", required: true, min: 1, max: 256, suggested: 4, help: "Number of elements (ports)." },
      { name: "return_loss_db", label: "Return loss", unit: "dB", kind: "number", required: true, min: 0, infinite: true, suggested: 15, help: "Return loss of every element; null means matched." },
      {
        name: "coupling_db",
        label: "Adjacent coupling",
        unit: "dB",
        kind: "number",
        required: true,
        min: 0,
        minExclusive: true,
        infinite: true,
        suggested: 20,
        help: "Coupling loss between neighbours as a positive number: 20 means |S21| = −20 dB; null means none.",
      },
      {
        name: "coupling_falloff_db",
        label: "Coupling fall-off",
        unit: "dB",
        kind: "number",
        default: null,
        required: false,
        min: 0,
        infinite: true,
        help: "Extra coupling loss per further element; null (default) means only neighbours couple.",
      },
    ],
  },
};
