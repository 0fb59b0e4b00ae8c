// Temporary folders for the io tests, under os.tmpdir(), removed after each file's tests.
import { mkdtempSync, readdirSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll } from "vitest";

/** Makes a fresh folder for one test file and removes it (with everything in it) afterwards. */
export function useTempDir(prefix: string): { path(name: string): string; dir: string; files(): string[] } {
  const dir = mkdtempSync(join(tmpdir(), `chirpsieve-io-${prefix}-`));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));
  return { dir, path: (name) => join(dir, name), files: () => readdirSync(dir).sort() };
}

/** Deterministic pseudo-random strain-like samples of size ~1e-21 (a fixed LCG; no Math.random). */
export function syntheticStrain(n: number, seed = 1): Float64Array {
  const out = new Float64Array(n);
  let x = seed >>> 0;
  for (let i = 0; i < n; i++) {
    x = (Math.imul(x, 1664525) + 1013904223) >>> 0;
    out[i] = ((x / 2 ** 32) * 2 - 1) * 1e-21 * (1 + Math.sin(i / 7));
  }
  return out;
}
