// Property tests: whatever bytes a strain file holds, reading it either succeeds with a sane
// series or throws InputError — never another error type, never a hang, never silent garbage.
import { readFileSync, writeFileSync } from "node:fs";
import fc from "fast-check";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { InputError, openStrain, readStrain, writeStrain } from "@chirpsieve/core";
import type { StrainOpenOptions } from "@chirpsieve/core";
import { setHdf5TimeoutMs } from "../../packages/core/src/io/hdf5Client.js";
import { syntheticStrain, useTempDir } from "./tempDir.js";

const tmp = useTempDir("prop");
let fileIndex = 0;

/** Reads `path`; returns "ok" or "input-error", and fails the property on anything else. */
async function readOrInputError(path: string, options: StrainOpenOptions = {}): Promise<"ok" | "input-error"> {
  try {
    const s = await readStrain(path, options);
    expect(s.sampleRate).toBeGreaterThan(0);
    expect(Number.isFinite(s.sampleRate)).toBe(true);
    expect(Number.isFinite(s.startTime)).toBe(true);
    expect(s.data.length).toBeGreaterThan(0);
    if (options.nonFinite !== "allow") for (const x of s.data) expect(Number.isFinite(x)).toBe(true);
    // Chunked reads agree with the whole read.
    const src = await openStrain(path, options);
    try {
      const mid = src.length >> 1;
      const a = await src.read(0, mid);
      const b = await src.read(mid, src.length - mid);
      expect([...a, ...b]).toEqual([...s.data]);
    } finally {
      await src.close();
    }
    return "ok";
  } catch (err) {
    if (err instanceof InputError) {
      expect(err.message).not.toMatch(/\n/);
      expect(err.message.length).toBeGreaterThan(0);
      return "input-error";
    }
    throw err;
  }
}

const sidecarValue = fc.oneof(
  fc.double(),
  fc.integer(),
  fc.string({ maxLength: 6 }),
  fc.constantFrom(null, true, [], {}, 4096, 0, -1, 1e-300, "float32", "float64"),
);

const plausible = <T>(good: T[]) => fc.oneof({ weight: 3, arbitrary: fc.constantFrom(...good) }, { weight: 1, arbitrary: sidecarValue });

const sidecarText = fc.oneof(
  { weight: 1, arbitrary: fc.string({ maxLength: 40 }) },
  { weight: 1, arbitrary: fc.json({ maxDepth: 2 }) },
  // Mostly plausible sidecars, so that reads succeed often enough to check them.
  {
    weight: 4,
    arbitrary: fc
      .record(
        {
          sampleRate: plausible([4096, 0.25, 16384]),
          startTime: plausible([0, -5, 1e9]),
          sampleType: plausible(["float32", "float64"]),
          length: fc.oneof(plausible([1, 2, 4, 8]), fc.nat(30)),
          label: plausible(["synthetic"]),
        },
        { requiredKeys: ["sampleRate", "startTime"] },
      )
      .map((o) => JSON.stringify(o)),
  },
  {
    weight: 2,
    arbitrary: fc
      .record(
        {
          sampleRate: sidecarValue,
          startTime: sidecarValue,
          sampleType: sidecarValue,
          length: fc.oneof(sidecarValue, fc.nat(64)),
          label: sidecarValue,
          units: sidecarValue,
        },
        { requiredKeys: [] },
      )
      .map((o) => JSON.stringify(o)),
  },
);

describe("strain readers on arbitrary input", () => {
  it("raw .f32/.f64: arbitrary bytes with an arbitrary sidecar read or throw InputError", async () => {
    const outcomes = { ok: 0, "input-error": 0 };
    await fc.assert(
      fc.asyncProperty(
        fc.constantFrom("f32", "f64"),
        fc.oneof(
          fc.uint8Array({ maxLength: 96 }),
          // Whole float64 samples, so that sizes fit and reads succeed often enough to check.
          fc
            .array(fc.double({ min: -1e30, max: 1e30, noNaN: true }), { minLength: 1, maxLength: 12 })
            .map((a) => new Uint8Array(Float64Array.from(a).buffer)),
        ),
        sidecarText,
        fc.constantFrom<StrainOpenOptions["nonFinite"]>("error", "allow"),
        async (ext, bytes, sidecar, nonFinite) => {
          const p = tmp.path(`raw${fileIndex++}.${ext}`);
          writeFileSync(p, bytes);
          writeFileSync(`${p}.json`, sidecar);
          outcomes[await readOrInputError(p, { nonFinite })]++;
        },
      ),
      { seed: 42, numRuns: 300 },
    );
    // Both outcomes occur, so the property is not vacuous.
    expect(outcomes.ok).toBeGreaterThan(0);
    expect(outcomes["input-error"]).toBeGreaterThan(0);
  });

  it("raw: valid sidecars over arbitrary bytes mostly read, and sizes are honoured", async () => {
    let ok = 0;
    await fc.assert(
      fc.asyncProperty(fc.uint8Array({ minLength: 1, maxLength: 64 }), fc.double({ min: 1, max: 1e5, noNaN: true }), async (bytes, rate) => {
        const p = tmp.path(`rawv${fileIndex++}.f32`);
        writeFileSync(p, bytes);
        writeFileSync(`${p}.json`, JSON.stringify({ sampleRate: rate, startTime: 0 }));
        if ((await readOrInputError(p, { nonFinite: "allow" })) === "ok") {
          ok++;
          expect(bytes.length % 4).toBe(0);
          expect((await readStrain(p, { nonFinite: "allow" })).data.length).toBe(bytes.length / 4);
        } else {
          expect(bytes.length % 4).not.toBe(0);
        }
      }),
      { seed: 42, numRuns: 150 },
    );
    expect(ok).toBeGreaterThan(0);
  });

  const token = fc.oneof(
    fc.constantFrom("0", "1", "-1.5e-21", ".5", "1.", "nan", "-Inf", "1e309", "0x1", "1,,2", "#", "# label: x", "", "  ", "\t", ",", "e5", "--1"),
    fc.double().map(String),
    fc.integer({ min: -3, max: 1000 }).map(String),
    fc.string({ maxLength: 5 }),
  );
  const line = fc.array(token, { maxLength: 3 }).chain((parts) => fc.constantFrom(" ", ",", "\t", " , ").map((sep) => parts.join(sep)));
  const textBody = fc.oneof(
    fc.string({ maxLength: 80 }),
    fc.array(line, { maxLength: 12 }).chain((lines) => fc.constantFrom("\n", "\r\n", "\r").map((nl) => lines.join(nl))),
    // Mostly-even two-column files with one line disturbed.
    fc
      .tuple(fc.integer({ min: 2, max: 20 }), fc.double({ min: 1e-3, max: 10, noNaN: true }), fc.nat(19), token)
      .map(([n, dt, k, bad]) => Array.from({ length: n }, (_, i) => (i === k ? `${bad} ${i}` : `${i * dt} ${i}`)).join("\n")),
  );

  it("text: arbitrary files read or throw InputError", async () => {
    const outcomes = { ok: 0, "input-error": 0 };
    await fc.assert(
      fc.asyncProperty(
        textBody,
        fc.constantFrom("txt", "csv", "dat"),
        fc.option(fc.oneof(fc.double({ min: 1e-3, max: 1e5, noNaN: true }), fc.constantFrom(0, -1, Number.NaN)), { nil: undefined }),
        fc.constantFrom<StrainOpenOptions["nonFinite"]>("error", "allow"),
        async (text, ext, rate, nonFinite) => {
          const p = tmp.path(`text${fileIndex++}.${ext}`);
          writeFileSync(p, text);
          outcomes[await readOrInputError(p, { rate, nonFinite })]++;
        },
      ),
      { seed: 42, numRuns: 400 },
    );
    expect(outcomes.ok).toBeGreaterThan(0);
    expect(outcomes["input-error"]).toBeGreaterThan(0);
  });

  describe("HDF5 (.h5)", () => {
    const signature = [0x89, 0x48, 0x44, 0x46, 0x0d, 0x0a, 0x1a, 0x0a];
    let valid: Uint8Array;
    beforeAll(async () => {
      // A bounded time per request, so a file that makes the library loop costs seconds, not forever.
      setHdf5TimeoutMs(3000);
      const p = tmp.path("valid.h5");
      await writeStrain(p, { data: syntheticStrain(100, 5), sampleRate: 512, startTime: 3, label: "synthetic" });
      valid = new Uint8Array(readFileSync(p));
    });
    afterAll(() => setHdf5TimeoutMs(60_000));

    it("arbitrary bytes, and arbitrary bytes after the HDF5 signature, throw InputError", async () => {
      await fc.assert(
        fc.asyncProperty(fc.uint8Array({ maxLength: 600 }), fc.boolean(), async (bytes, signed) => {
          const p = tmp.path(`junk${fileIndex++}.h5`);
          writeFileSync(p, signed ? new Uint8Array([...signature, ...bytes]) : bytes);
          expect(await readOrInputError(p, { rate: 1, start: 0 })).toBe("input-error");
        }),
        { seed: 42, numRuns: 60 },
      );
    });

    it("a valid file with arbitrary bytes changed or cut reads or throws InputError", async () => {
      const outcomes = { ok: 0, "input-error": 0 };
      await fc.assert(
        fc.asyncProperty(
          fc.array(fc.tuple(fc.nat(), fc.integer({ min: 0, max: 255 })), { minLength: 1, maxLength: 8 }),
          fc.option(fc.nat(), { nil: undefined }),
          async (changes, cut) => {
            let bytes = Uint8Array.from(valid);
            for (const [at, value] of changes) bytes[8 + (at % (bytes.length - 8))] = value;
            if (cut !== undefined) bytes = bytes.subarray(0, cut % bytes.length);
            const p = tmp.path(`mut${fileIndex++}.h5`);
            writeFileSync(p, bytes);
            outcomes[await readOrInputError(p, { nonFinite: "allow" })]++;
          },
        ),
        { seed: 42, numRuns: 150 },
      );
      expect(outcomes.ok).toBeGreaterThan(0);
      expect(outcomes["input-error"]).toBeGreaterThan(0);
    });
  });
});
