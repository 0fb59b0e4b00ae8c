import type { GateRecord } from "./types.js";

/**
 * Adds a gate to the run's list unless it is one already there: segments overlap, so a transient
 * in an overlap is gated in each segment that holds it, at the same time to within a few samples.
 */
export function addGate(gates: GateRecord[], g: GateRecord): void {
  for (const x of gates) if (Math.abs(x.time - g.time) < Math.max(x.zeroedSeconds, g.zeroedSeconds) / 2) return;
  gates.push({ ...g });
  gates.sort((a, b) => a.time - b.time);
}
