/**
 * Scenarios for the benchmark (and for other benchmark rows: state sweep, leak trace). All systems are
 * invented for Portolan; no real products.
 */
import type { BlockSpec, Scenario, SystemPortSpec } from "../../engine/types";

/**
 * A dual-channel S-band radar/communication front end: two transmit chains (amplifier, isolator,
 * coupler with detector port, filter), a circulator, three SP4T and two SPDT switches, two LNAs,
 * a splitter, a pad, a line, five antennas and three loads; 8 system ports, 1001 points (2–4 GHz).
 * 29 blocks, 69 block ports, with one loop (two paths between SW2 and SW3) and three unlinked ports.
 *
 * @param points - frequency points (default 1001)
 * @example
 * const sys = prepareSystem(referenceFrontEnd());
 */
export function referenceFrontEnd(points = 1001): Scenario {
  const amp = (id: string, gain: number, rating: number): BlockSpec => ({
    id,
    kind: "amplifier",
    params: { gain_db: gain, reverse_isolation_db: 40, input_return_loss_db: 14, output_return_loss_db: 12 },
    rating_dbm: rating,
  });
  const sp4t = (id: string, state: number): BlockSpec => ({
    id,
    kind: "switch",
    params: { throws: 4, insertion_loss_db: 0.6, isolation_db: 35 },
    state,
    rating_dbm: 36,
  });
  const spdt = (id: string, state: number): BlockSpec => ({
    id,
    kind: "switch",
    params: { throws: 2, insertion_loss_db: 0.4, isolation_db: 28, off_state: "reflective" },
    state,
    rating_dbm: 33,
  });
  const bandpass = (id: string, order: number): BlockSpec => ({
    id,
    kind: "filter",
    params: { response: "bandpass", family: "chebyshev", order, ripple_db: 0.1, center_hz: 3e9, bandwidth_hz: 4e8 },
  });
  const coupler = (id: string, coupling: number): BlockSpec => ({
    id,
    kind: "coupler",
    params: { coupling_db: coupling, directivity_db: 22, excess_loss_db: 0.15 },
  });
  const antenna = (id: string, rl: number): BlockSpec => ({ id, kind: "antenna", params: { return_loss_db: rl, phase_deg: 30 } });
  const load = (id: string): BlockSpec => ({ id, kind: "load", params: { return_loss_db: 26 } });
  const blocks: BlockSpec[] = [
    amp("PA1", 25, 10),
    amp("PA2", 25, 10),
    { id: "ISO1", kind: "isolator", params: { insertion_loss_db: 0.3, isolation_db: 20, return_loss_db: 20 } },
    { id: "ISO2", kind: "isolator", params: { insertion_loss_db: 0.3, isolation_db: 20, return_loss_db: 20 } },
    coupler("CPL1", 20),
    coupler("CPL2", 20),
    coupler("CPL3", 15),
    load("LD1"),
    load("LD2"),
    load("LD3"),
    bandpass("FLT1", 5),
    bandpass("FLT2", 5),
    bandpass("FLT3", 3),
    { id: "CIRC", kind: "circulator", params: { insertion_loss_db: 0.3, isolation_db: 23, return_loss_db: 22 }, rating_dbm: 40 },
    sp4t("SW1", 1),
    sp4t("SW2", 1),
    sp4t("SW3", 1),
    spdt("SPDT1", 1),
    spdt("SPDT2", 1),
    amp("LNA1", 20, 0),
    amp("LNA2", 20, 0),
    { id: "PAD", kind: "attenuator", params: { loss_db: 6 } },
    { id: "SPL", kind: "splitter", params: { excess_loss_db: 0.2, isolation_db: 22 } },
    { id: "LINE", kind: "line", params: { length_m: 0.35, velocity_factor: 0.7, loss_db_per_m: 0.5 } },
    antenna("ANT1", 15),
    antenna("ANT2", 14),
    antenna("ANT3", 16),
    antenna("ANT4", 13),
    antenna("ANT5", 12),
  ];
  const links: [string, string][] = [
    ["PA1:2", "ISO1:1"],
    ["ISO1:2", "CPL1:1"],
    ["CPL1:4", "LD1:1"],
    ["CPL1:2", "FLT1:1"],
    ["FLT1:2", "CIRC:1"],
    ["CIRC:2", "SW1:1"],
    ["SW1:2", "ANT1:1"],
    ["SW1:3", "ANT2:1"],
    ["SW1:4", "LINE:1"],
    ["LINE:2", "ANT3:1"],
    ["CIRC:3", "SPDT1:1"],
    ["SPDT1:2", "LNA1:1"],
    ["SPDT1:3", "LD3:1"],
    ["LNA1:2", "FLT3:1"],
    ["FLT3:2", "SPL:1"],
    ["SPL:3", "SPDT2:1"],
    ["SPDT2:3", "PAD:1"],
    ["PAD:2", "SW3:2"],
    ["PA2:2", "ISO2:1"],
    ["ISO2:2", "CPL2:1"],
    ["CPL2:4", "LD2:1"],
    ["CPL2:2", "FLT2:1"],
    ["FLT2:2", "SW2:1"],
    ["SW2:2", "ANT4:1"],
    ["SW2:3", "CPL3:1"],
    ["CPL3:2", "ANT5:1"],
    ["CPL3:3", "SW3:3"],
    ["SW2:4", "SW3:4"],
    ["SW3:1", "LNA2:1"],
  ];
  const ports: SystemPortSpec[] = [
    { name: "TX1", at: "PA1:1" },
    { name: "TX2", at: "PA2:1" },
    { name: "DET1", at: "CPL1:3" },
    { name: "DET2", at: "CPL2:3" },
    { name: "CAL", at: "SW1:5" },
    { name: "RX1", at: "SPL:2" },
    { name: "AUX", at: "SPDT2:2" },
    { name: "RX2", at: "LNA2:2" },
  ];
  return {
    format: "portolan.scenario/1",
    name: "Reference front end (benchmark, invented)",
    z0: 50,
    frequency: { start: 2e9, stop: 4e9, points },
    blocks,
    links,
    ports,
    rules: [
      { kind: "isolation", from: "TX1", to: "RX1", band: [2.8e9, 3.2e9], min_db: 40 },
      { kind: "isolation", from: "TX2", to: "RX2", band: [2.8e9, 3.2e9], min_db: 40 },
      { kind: "match", port: "TX1", band: [2.8e9, 3.2e9], min_return_loss_db: 10 },
    ],
  };
}

/** Ids of the switches of referenceFrontEnd() and their throw counts (for a state sweep). */
export const FRONT_END_SWITCHES: { id: string; throws: number }[] = [
  { id: "SW1", throws: 4 },
  { id: "SW2", throws: 4 },
  { id: "SW3", throws: 4 },
  { id: "SPDT1", throws: 2 },
  { id: "SPDT2", throws: 2 },
];

/**
 * A chain of n two-ports (attenuator 0.01 dB, 55 Ω line 10 mm, phase shifter 10° with 0.01 dB loss,
 * repeating), with system ports IN at the first block and OUT at the last; 1001 points, 1–2 GHz.
 * The 55 Ω lines make every junction reflect, so that the chain is not trivially matched.
 *
 * @param n - number of two-ports (≥ 1)
 * @param points - frequency points (default 1001)
 * @example
 * chain(100).blocks.length; // 100
 */
export function chain(n: number, points = 1001): Scenario {
  const blocks: BlockSpec[] = [];
  for (let i = 0; i < n; i++) {
    const id = `B${i + 1}`;
    if (i % 3 === 0) blocks.push({ id, kind: "attenuator", params: { loss_db: 0.01 } });
    else if (i % 3 === 1) blocks.push({ id, kind: "line", params: { length_m: 0.01, impedance: 55 } });
    else blocks.push({ id, kind: "phase_shifter", params: { phase_deg: 10, loss_db: 0.01 } });
  }
  const links: [string, string][] = [];
  for (let i = 1; i < n; i++) links.push([`B${i}:2`, `B${i + 1}:1`]);
  return {
    format: "portolan.scenario/1",
    name: `Chain of ${n} two-ports (benchmark)`,
    z0: 50,
    frequency: { start: 1e9, stop: 2e9, points },
    blocks,
    links,
    ports: [
      { name: "IN", at: "B1:1" },
      { name: "OUT", at: `B${n}:2` },
    ],
  };
}

/**
 * A 64-element receive array: an `array` block (64 coupled elements), 64 phase shifters, 64 SPDT
 * switches (throw 1 to the beam former, throw 2 unlinked, a matched termination) and a binary
 * combining tree of 63 splitters; one system port SUM at the root; 201 points, 9–10 GHz.
 * 192 blocks, 573 block ports.
 *
 * @param points - frequency points (default 201)
 * @example
 * array64().blocks.length; // 192
 */
export function array64(points = 201): Scenario {
  const n = 64;
  const blocks: BlockSpec[] = [
    { id: "ARR", kind: "array", params: { elements: n, return_loss_db: 12, coupling_db: 18, coupling_falloff_db: 6 } },
  ];
  const links: [string, string][] = [];
  for (let e = 1; e <= n; e++) {
    // a linear progressive phase steers the beam; values are arbitrary but distinct
    blocks.push({ id: `PS${e}`, kind: "phase_shifter", params: { phase_deg: (e * 22.5) % 360, loss_db: 1.5 } });
    blocks.push({ id: `SW${e}`, kind: "switch", params: { throws: 2, insertion_loss_db: 0.5, isolation_db: 30 }, state: 1 });
    links.push([`ARR:${e}`, `PS${e}:2`], [`PS${e}:1`, `SW${e}:2`]);
  }
  // splitters numbered as a heap: S1 is the root, Sk has children S2k and S2k+1; leaves S32…S63 feed switches
  for (let k = 1; k < n; k++) {
    blocks.push({ id: `S${k}`, kind: "splitter", params: { excess_loss_db: 0.2, isolation_db: 20 } });
  }
  for (let k = 1; k < n; k++) {
    for (const [port, child] of [
      [2, 2 * k],
      [3, 2 * k + 1],
    ] as const) {
      if (child < n) links.push([`S${k}:${port}`, `S${child}:1`]);
      else links.push([`S${k}:${port}`, `SW${child - n + 1}:1`]);
    }
  }
  return {
    format: "portolan.scenario/1",
    name: "64-element array with phase shifters, switches and a combining tree (benchmark)",
    z0: 50,
    frequency: { start: 9e9, stop: 10e9, points },
    blocks,
    links,
    ports: [{ name: "SUM", at: "S1:1" }],
  };
}
