import { readdirSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { describe, expect, it } from "vitest";
import { openStrain, readStrain, writeStrain } from "@chirpsieve/core";
import { syntheticStrain, useTempDir, inputErrorOf } from "./tempDir.js";

const tmp = useTempDir("text");

function textFile(name: string, text: string): string {
  const p = tmp.path(name);
  writeFileSync(p, text);
  return p;
}


describe("text strain files", () => {
  const data = syntheticStrain(3000, 11);

  it("round-trips two-column .txt and .csv within 1e-15 relative (shortest round-trip numbers: exact)", async () => {
    for (const name of ["rt.txt", "rt.csv", "rt.dat"]) {
      const p = tmp.path(name);
      await writeStrain(p, { data, sampleRate: 4096, startTime: 1_000_000_000, label: "synthetic L", units: "strain" });
      const s = await readStrain(p);
      expect(s.sampleRate).toBe(4096);
      expect(s.startTime).toBe(1_000_000_000);
      expect(s.label).toBe("synthetic L");
      expect(s.units).toBe("strain");
      let worst = 0;
      for (let i = 0; i < data.length; i++) worst = Math.max(worst, Math.abs(s.data[i] - data[i]) / Math.abs(data[i]));
      expect(worst).toBeLessThanOrEqual(1e-15);
      if (name.endsWith(".csv")) expect(readFileSync(p, "utf8")).toMatch(/\n1000000000,/);
    }
  });

  it("streams a file longer than one in-memory block exactly, leaving no temporary file", async () => {
    // 200 000 samples: past the 2^16 values kept in memory (the rest go to a temporary file) and
    // over many 64 KiB read chunks.
    const n = 200_000;
    const values = Array.from({ length: n }, (_, i) => Math.sin(0.001 * i) * 1e-21 + i * 1e-30);
    const p = textFile("long.txt", `# long\r\n${values.map((v) => String(v)).join("\r\n")}\r\n`);
    const columns = () => readdirSync(tmpdir()).filter((f) => f.startsWith(".chirpsieve-column-"));
    const before = columns();
    const src = await openStrain(p, { rate: 1000, start: 5 });
    expect(src.length).toBe(n);
    expect(Array.from(await src.read(65_530, 20))).toEqual(values.slice(65_530, 65_550));
    expect(Array.from(await src.read(n - 3, 3))).toEqual(values.slice(n - 3));
    await src.close();
    expect((await readStrain(p, { rate: 1000 })).data).toEqual(Float64Array.from(values));
    expect(columns()).toEqual(before);
  });

  it("counts a CRLF split across two read chunks as one line break (line numbers stay right)", async () => {
    // Line 1 is a comment of 65 535 characters, so its "\r" is the last byte of the first 64 KiB
    // read and its "\n" the first byte of the next.
    const p = textFile("split.txt", `#${"a".repeat(65_534)}\r\n1e-21\r\noops\r\n`);
    expect(await inputErrorOf(readStrain(p, { rate: 10 }))).toBe(`${p}: line 3: malformed number "oops"`);
  });

  it("chunked reads through the same StrainReader equal the whole read", async () => {
    const p = tmp.path("chunks.txt");
    await writeStrain(p, { data, sampleRate: 1000, startTime: 0.5 });
    const whole = (await readStrain(p)).data;
    const src = await openStrain(p);
    const parts = [await src.read(0, 1), await src.read(1, 998), await src.read(999, 0), await src.read(999, 2001)];
    expect(Float64Array.from(parts.flatMap((a) => [...a]))).toEqual(whole);
    await expect(src.read(2999, 2)).rejects.toBeInstanceOf(RangeError);
    await src.close();
  });

  it("reads one column with --rate/--start; comments, blank lines, tabs, CRLF and NaN spellings", async () => {
    const p = textFile("one.dat", "# synthetic\r\n\r\n1.5e-21\r\n  -2e-21   # trailing comment\r\n\t3E-21\r\n");
    const s = await readStrain(p, { rate: 512, start: 7 });
    expect([...s.data]).toEqual([1.5e-21, -2e-21, 3e-21]);
    expect(s).toMatchObject({ sampleRate: 512, startTime: 7 });
    expect((await readStrain(p, { rate: 512 })).startTime).toBe(0);
  });

  it("accepts comma, whitespace and tab separators in two columns", async () => {
    const p = textFile("sep.csv", "0,1\n0.5 , 2\n1\t3\n1.5   4\n");
    const s = await readStrain(p);
    expect([...s.data]).toEqual([1, 2, 3, 4]);
    expect(s.sampleRate).toBe(2);
  });

  it("accepts GPS-scale times written with 9 decimals at 16384 Hz (float64 spacing ~1e-7 s there)", async () => {
    const lines: string[] = [];
    for (let i = 0; i < 20_000; i++) lines.push(`${(1_234_567_890 + i / 16384).toFixed(9)} ${i}`);
    const s = await readStrain(textFile("gps.txt", lines.join("\n")));
    expect(s.sampleRate).toBe(16384);
    expect(s.startTime).toBe(1_234_567_890);
  });

  it("accepts times written with 6 decimals at 4096 Hz (rounding 5e-7 s, 0.2% of a step)", async () => {
    const lines: string[] = [];
    for (let i = 0; i < 8192; i++) lines.push(`${(100 + i / 4096).toFixed(6)}, ${i}`);
    const s = await readStrain(textFile("six.csv", lines.join("\n")));
    expect(s.sampleRate).toBe(4096);
  });

  it("keeps a rate that is not a whole number of Hz", async () => {
    const lines: string[] = [];
    for (let i = 0; i < 100; i++) lines.push(`${i * 0.3} ${i}`);
    const s = await readStrain(textFile("third.txt", lines.join("\n")));
    expect(s.sampleRate).toBeCloseTo(1 / 0.3, 12);
  });

  describe("errors name the file, the line and the problem", () => {
    it("one column without a rate names the rate option (the CLI shows it as --rate)", async () => {
      const p = textFile("norate.txt", "1\n2\n");
      const msg = await inputErrorOf(readStrain(p));
      expect(msg).toContain(p);
      expect(msg).toMatch(/^rate: .*give its sample rate/);
    });
    it("an uneven step names its line", async () => {
      const p = textFile("gap.txt", "# header\n0 1\n1 1\n2 1\n4 1\n5 1\n6 1\n");
      expect(await inputErrorOf(readStrain(p))).toBe(`${p}: line 5: uneven time step 2 s (the usual step is 1 s)`);
    });
    it("a slow drift (each step 1e-7 too long after line 500: locally fine) is caught against t0 + i·dt", async () => {
      const lines: string[] = [];
      let t = 0;
      for (let i = 0; i < 1000; i++) {
        lines.push(`${t} 0`);
        t += i < 500 ? 1 : 1 + 1e-7;
      }
      const msg = await inputErrorOf(readStrain(textFile("drift.txt", lines.join("\n"))));
      expect(msg).toMatch(/drift\.txt: line \d+: time .* is off the even grid/);
    });
    it("times that do not increase", async () => {
      const p = textFile("back.txt", "0 1\n1 1\n1 1\n");
      expect(await inputErrorOf(readStrain(p))).toBe(`${p}: line 3: time 1 does not increase (previous 1)`);
    });
    it("a malformed number names the line (and suggests # for a header that is not plain column names)", async () => {
      const p = textFile("bad.txt", "0 1\n1 2e\n");
      expect(await inputErrorOf(readStrain(p))).toBe(`${p}: line 2: malformed number "2e"`);
      const h = textFile("header.csv", "time,strain = h(t)\n0,1\n");
      expect(await inputErrorOf(readStrain(h))).toContain("line 1: malformed number \"time\" (start header lines with #)");
      const hex = textFile("hex.txt", "0x10\n");
      expect(await inputErrorOf(readStrain(hex, { rate: 1 }))).toContain("line 1: malformed number");
      const empty = textFile("emptyfield.csv", "0,,1\n");
      expect(await inputErrorOf(readStrain(empty))).toContain("line 1:");
    });
    it("a changing column count names the line", async () => {
      const p = textFile("cols.txt", "0 1\n1 2\n3\n");
      expect(await inputErrorOf(readStrain(p))).toBe(`${p}: line 3: expected 2 columns like line 1, got 1`);
      const q = textFile("three.txt", "0 1 2\n");
      expect(await inputErrorOf(readStrain(q))).toContain("line 1: expected 1 column (strain) or 2 columns (time, strain), got 3");
    });
    it("an empty file, or one with only comments", async () => {
      expect(await inputErrorOf(readStrain(textFile("empty.txt", "")))).toContain("empty file");
      expect(await inputErrorOf(readStrain(textFile("comments.txt", "# a\n\n# b\n"), { rate: 1 }))).toContain("no samples");
    });
    it("a non-finite sample names line, sample and time; nonFinite: allow keeps it", async () => {
      const p = textFile("nan.txt", "# h\n10 1\n10.5 NaN\n11 -inf\n");
      expect(await inputErrorOf(readStrain(p))).toBe(`${p}: line 3: sample 1 (t = 10.5 s) is NaN; non-finite samples are rejected`);
      const s = await readStrain(p, { nonFinite: "allow" });
      expect(Number.isNaN(s.data[1])).toBe(true);
      expect(s.data[2]).toBe(-Infinity);
    });
    it("a non-finite time is refused even with nonFinite: allow", async () => {
      const p = textFile("nantime.txt", "0 1\nnan 1\n");
      expect(await inputErrorOf(readStrain(p, { nonFinite: "allow" }))).toBe(`${p}: line 2: time nan is not a finite number`);
    });
    it("rate/start options that disagree with the time column", async () => {
      const p = textFile("opts.txt", "0 1\n0.25 2\n0.5 3\n");
      expect(await inputErrorOf(readStrain(p, { rate: 5 }))).toContain("given rate 5 Hz disagrees with the time column (4 Hz)");
      expect(await inputErrorOf(readStrain(p, { start: 1 }))).toContain("given start 1 s disagrees");
      expect((await readStrain(p, { rate: 4, start: 0 })).data.length).toBe(3);
    });
    it("a single two-column row needs the rate option", async () => {
      const p = textFile("single.txt", "5 1\n");
      expect(await inputErrorOf(readStrain(p))).toMatch(/^rate: .*one sample cannot show the sample rate/);
      expect(await readStrain(p, { rate: 8 })).toMatchObject({ sampleRate: 8, startTime: 5 });
    });
    it("bad rate / start options name the option (the CLI maps it to its flag)", async () => {
      const p = textFile("flags.txt", "1\n");
      expect(await inputErrorOf(readStrain(p, { rate: 0 }))).toBe("rate: must be a positive number of Hz (got 0)");
      expect(await inputErrorOf(readStrain(p, { rate: 1, start: Number.NaN }))).toBe("start: must be a finite number of seconds (got NaN)");
      expect(await inputErrorOf(readStrain(p, { rate: 1e9 }))).toMatch(/^rate: 1000000000 Hz is above the highest sample rate chirpsieve handles, 131072 Hz/);
    });
    it("a missing file", async () => {
      const p = tmp.path("missing.csv");
      expect(await inputErrorOf(readStrain(p))).toBe(`${p}: no such file`);
    });
  });
});

describe("a header line of column names", () => {
  it("is accepted before two columns, comma- or space-separated", async () => {
    for (const [name, head] of [["h.csv", "time,strain"], ["h.txt", "time strain"], ["q.csv", '"time","strain"'], ["u.txt", "t_s\th"]] as const) {
      const p = textFile(name, `# label: x\n${head}\n10,1e-21\n10.25,-2e-21\n10.5,3e-21\n`.replace(/,/g, name.endsWith(".csv") ? "," : " "));
      const s = await readStrain(p);
      expect(s).toMatchObject({ sampleRate: 4, startTime: 10, label: "x" });
      expect(Array.from(s.data)).toEqual([1e-21, -2e-21, 3e-21]);
    }
  });

  it("is accepted before one column (with --rate)", async () => {
    const p = textFile("one.txt", "strain\n1\n2\n");
    expect(Array.from((await readStrain(p, { rate: 2 })).data)).toEqual([1, 2]);
  });

  it("must name as many columns as the data has (error names the file and both lines)", async () => {
    const p = textFile("mismatch.csv", "time,strain\n1\n2\n");
    const msg = await inputErrorOf(readStrain(p, { rate: 1 }));
    expect(msg).toBe(`${p}: line 2: 1 column of data, but the header on line 1 names 2`);
  });

  it("only one, and only before the data: a name among numbers is still malformed", async () => {
    const p = textFile("twice.csv", "time,strain\ntime,strain\n0,1\n1,2\n");
    expect(await inputErrorOf(readStrain(p))).toContain("line 2: malformed number");
    const q = textFile("late.csv", "0,1\ntime,strain\n1,2\n");
    expect(await inputErrorOf(readStrain(q))).toContain("line 2: malformed number");
  });
});
