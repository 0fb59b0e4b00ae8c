import { describe, expect, it, vi } from "vitest";
import { mkdtempSync, readFileSync, readdirSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { ajith2011, buildBank, readBankFile, writeBankFile } from "@chirpsieve/core";
import { formatBankFile, parseBankFile } from "../../packages/core/src/bank/bankFile.js";

/**
 * Fault injection for the atomic-write test: while `fault.failAfterBytes` is set, the library's
 * writeSync writes at most that many bytes for real and then throws ENOSPC, as a full disk would
 * in the middle of a write. Otherwise it is the real writeSync.
 */
const fault = vi.hoisted(() => ({ failAfterBytes: undefined as number | undefined, written: 0 }));
vi.mock("node:fs", async (importOriginal) => {
  const fs = await importOriginal<typeof import("node:fs")>();
  const writeSync = ((fd: number, buffer: Uint8Array, offset?: number, length?: number) => {
    if (fault.failAfterBytes === undefined) return (fs.writeSync as Function)(fd, buffer, offset, length);
    const room = fault.failAfterBytes - fault.written;
    if (room <= 0) throw Object.assign(new Error("ENOSPC: no space left on device, write"), { code: "ENOSPC", syscall: "write" });
    const n = (fs.writeSync as Function)(fd, buffer, offset, Math.min(room, length ?? buffer.length - (offset ?? 0)));
    fault.written += n;
    return n;
  }) as typeof fs.writeSync;
  return { ...fs, default: { ...fs, writeSync }, writeSync };
});

const bank = buildBank({ massRangeSolar: [8, 20], matchFloor: 0.95, fMinHz: 20, psd: ajith2011, massRatioCap: 2 });
/** A template with unequal masses (swapping its masses makes it invalid). */
const unequal = bank.templates.findIndex((t) => t.primaryMassSolar > t.secondaryMassSolar * 1.01);
bank.generator = { tool: "chirpsieve", version: "0.0.0-test", arguments: ["bank", "--mass-range", "8:20"] };

describe("bank files", () => {
  it("round-trip exactly through write and read", () => {
    const dir = mkdtempSync(join(tmpdir(), "chirpsieve-bank-"));
    const path = join(dir, "bank.json");
    writeBankFile(path, bank);
    const back = readBankFile(path);
    expect(back).toEqual(bank);
    const json = JSON.parse(readFileSync(path, "utf8"));
    expect(Object.keys(json)).toEqual(["fMinHz", "matchFloor", "noiseCurve", "massRangeSolar", "massRatioCap", "generator", "templates"]);
    expect(Object.keys(json.templates[0])).toEqual(["primaryMassSolar", "secondaryMassSolar", "chirpMassSolar", "tau0", "tau3"]);
  });

  it("are read in the previous layout too (keys without units), and written back in the current one", () => {
    // A bank file as earlier versions wrote it: fmin, fmax, massRange, totalMassCap and the template
    // masses without units. Chirp times from 20 Hz and chirp masses are values measured here.
    const previous = `{
  "fmin": 20,
  "matchFloor": 0.95,
  "noiseCurve": "ajith2011",
  "massRange": [8, 15],
  "totalMassCap": 25,
  "fmax": 400,
  "generator": {"tool": "chirpsieve", "version": "0.0.0-old", "arguments": ["bank"]},
  "templates": [
    {"primaryMass": 10, "secondaryMass": 8, "chirpMass": 7.776774233174153, "tau0": 7.191762928123255, "tau3": 0.805502899581398},
    {"primaryMass": 14, "secondaryMass": 9, "chirpMass": 9.724712255905297, "tau0": 4.954957284625807, "tau3": 0.7091318490876833}
  ]
}
`;
    const old = parseBankFile(previous, "old.json");
    expect(old.fMinHz).toBe(20);
    expect(old.fMaxHz).toBe(400);
    expect(old.massRangeSolar).toEqual([8, 15]);
    expect(old.totalMassCapSolar).toBe(25);
    expect(old.templates.map((t) => [t.primaryMassSolar, t.secondaryMassSolar, t.chirpMassSolar])).toEqual([
      [10, 8, 7.776774233174153],
      [14, 9, 9.724712255905297],
    ]);
    // Its checks still apply under the previous names (a swapped pair is refused).
    expect(() => parseBankFile(previous.replace('"primaryMass": 10, "secondaryMass": 8', '"primaryMass": 8, "secondaryMass": 10'), "old.json")).toThrow(
      /^old\.json: templates\[0\]: secondaryMassSolar 10 exceeds primaryMassSolar 8/,
    );
    const written = JSON.parse(formatBankFile(old));
    expect(Object.keys(written)).toEqual(["fMinHz", "matchFloor", "noiseCurve", "massRangeSolar", "totalMassCapSolar", "fMaxHz", "generator", "templates"]);
    expect(Object.keys(written.templates[0])).toEqual(["primaryMassSolar", "secondaryMassSolar", "chirpMassSolar", "tau0", "tau3"]);
    expect(parseBankFile(formatBankFile(old), "new.json")).toEqual(old);
  });

  it("name the file and the entry when something is wrong", () => {
    const text = formatBankFile(bank);
    const edit = (f: (o: Record<string, any>) => void): string => {
      const o = JSON.parse(text);
      f(o);
      return JSON.stringify(o);
    };
    const bad: [string, RegExp][] = [
      ["{not json", /^b\.json: not valid JSON/],
      [edit((o) => delete o.fMinHz), /^b\.json: missing "fMinHz"/],
      [edit((o) => (o.matchFloor = 1.2)), /^b\.json: matchFloor must be strictly between 0 and 1/],
      [edit((o) => (o.massRangeSolar = [3, 1])), /^b\.json: massRangeSolar minimum 3 must be below the maximum 1/],
      [edit((o) => (o.templates = [])), /^b\.json: templates is empty/],
      [edit((o) => (o.templates[2].tau0 *= 1.01)), /^b\.json: templates\[2\]\.tau0 .* does not match the masses/],
      [edit((o) => (o.templates[1].chirpMassSolar = "1.2")), /^b\.json: templates\[1\]\.chirpMassSolar must be a number \(got "1\.2"\)/],
      [edit((o) => delete o.templates[0].tau3), /^b\.json: templates\[0\] is missing "tau3"/],
      [
        edit((o) => {
          const t = o.templates[unequal];
          [t.primaryMassSolar, t.secondaryMassSolar] = [t.secondaryMassSolar, t.primaryMassSolar];
        }),
        new RegExp(`^b\\.json: templates\\[${unequal}\\]: secondaryMassSolar .* exceeds primaryMassSolar`),
      ],
    ];
    for (const [content, message] of bad) {
      let error: Error | undefined;
      try {
        parseBankFile(content, "b.json");
      } catch (e) {
        error = e as Error;
      }
      expect(error?.name).toBe("InputError");
      expect(error?.message).toMatch(message);
      expect(error?.message.split("\n")).toHaveLength(1);
    }
  });

  it("writes atomically: a write that fails midway leaves the old file intact and no temporary file", () => {
    const dir = mkdtempSync(join(tmpdir(), "chirpsieve-bank-"));
    const path = join(dir, "bank.json");
    writeFileSync(path, "old bank");
    const text = formatBankFile(bank);
    fault.failAfterBytes = Math.floor(text.length / 2); // half the file reaches the disk, then it is full
    fault.written = 0;
    try {
      expect(() => writeBankFile(path, bank)).toThrow(/ENOSPC/);
    } finally {
      fault.failAfterBytes = undefined;
    }
    expect(fault.written).toBe(Math.floor(text.length / 2)); // the fault struck in mid-write
    expect(readFileSync(path, "utf8")).toBe("old bank");
    expect(readdirSync(dir)).toEqual(["bank.json"]);
    // Without the fault the same call replaces the file whole.
    writeBankFile(path, bank);
    expect(readFileSync(path, "utf8")).toBe(text);
    expect(readdirSync(dir)).toEqual(["bank.json"]);
  });
});
