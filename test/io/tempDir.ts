// Temporary folders for the io tests, under os.tmpdir(), removed after each file's tests.
import { mkdtempSync, readdirSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, expect } from "vitest";
import { InputError } from "@chirpsieve/core";

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

/** Awaits a promise that must reject with a one-line InputError, and returns its message. */
export async function inputErrorOf(p: Promise<unknown>): Promise<string> {
  const err = await p.then(
    () => undefined,
    (e: unknown) => e,
  );
  expect(err).toBeInstanceOf(InputError);
  const msg = (err as Error).message;
  expect(msg).not.toMatch(/\n/);
  return msg;
}
