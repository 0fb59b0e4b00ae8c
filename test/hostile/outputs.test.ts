// Hostile inputs against the outputs: each case is a command that must be refused before any work
// (exit 2, one line on stderr naming the flag or file), leaving every file in the scratch folder
// byte-identical and no file added (no output, no temporary file). Plus the cases that must work:
// writing through a link, removing stale temporary files. Needs the built CLI (`npm run build`).
import { spawnSync } from "node:child_process";
import { createHash } from "node:crypto";
import {
  chmodSync,
  copyFileSync,
  existsSync,
  linkSync,
  lstatSync,
  mkdirSync,
  mkdtempSync,
  readdirSync,
  readFileSync,
  readlinkSync,
  rmSync,
  symlinkSync,
  writeFileSync,
} from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { runCli } from "../cli/helpers.js";

const dir = mkdtempSync(join(tmpdir(), "chirpsieve-hostile-out-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const at = (name: string): string => join(dir, name);

/** A quick search: a handful of templates over 16 s of data. */
const SEARCH = ["--mass-range", "8:12", "--fmin", "40", "--match-floor", "0.9", "--quiet"];

/** Every entry under `root` (hidden ones too): its kind and content hash, or a link's target. */
function snapshot(root: string): Map<string, string> {
  const out = new Map<string, string>();
  const walk = (d: string, rel: string): void => {
    for (const name of readdirSync(d).sort()) {
      const p = join(d, name);
      const r = rel ? `${rel}/${name}` : name;
      const st = lstatSync(p);
      if (st.isSymbolicLink()) out.set(r, `link ${readlinkSync(p)}`);
      else if (st.isDirectory()) {
        out.set(r, "dir");
        walk(p, r);
      } else if (st.isFile()) out.set(r, `file ${createHash("sha256").update(readFileSync(p)).digest("hex")}`);
      else out.set(r, "special");
    }
  };
  walk(root, "");
  return out;
}

/** Runs the CLI in the scratch folder and checks the refusal: exit 2, one line, nothing changed. */
function expectRefused(args: string[], message: RegExp): void {
  const before = snapshot(dir);
  const r = runCli(args, { cwd: dir });
  expect(r.code, r.stderr).toBe(2);
  const lines = r.stderr.trim().split("\n");
  expect(lines, r.stderr).toHaveLength(1);
  expect(lines[0]).toMatch(/^chirpsieve: /);
  expect(lines[0]).toMatch(message);
  expect(r.stderr).not.toMatch(/ at |Error:|TypeError/);
  expect(snapshot(dir)).toEqual(before);
}

/** The pid of a process that has exited (so no live process owns it, at least for a while). */
function deadPid(): number {
  const r = spawnSync(process.execPath, ["-e", "process.stdout.write(String(process.pid))"], { encoding: "utf8" });
  return Number(r.stdout);
}

beforeAll(() => {
  const sim = runCli(["simulate", "--duration", "16", "--rate", "512", "--fmin", "40", "--seed", "7", "--out", "ok.f64"], { cwd: dir });
  expect(sim.code, sim.stderr).toBe(0);
  symlinkSync("ok.f64", at("l.f64"));
  symlinkSync("ok.f64.json", at("l.f64.json"));
  // A flat two-column noise-curve table (frequency Hz, PSD 1/Hz) from 1 Hz to 8 kHz.
  writeFileSync(at("c.txt"), [1, 10, 100, 1000, 8192].map((f) => `${f} 1e-46`).join("\n") + "\n");
  mkdirSync(at("sh"));
  for (const i of [0, 1]) {
    const r = runCli(["scan", "ok.f64", ...SEARCH, "--shard", `${i}/2`, "--out", `sh/part-${i}.jsonl`], { cwd: dir });
    expect(r.code, r.stderr).toBe(0);
  }
  mkdirSync(at("existing_dir"));
  writeFileSync(at("afile"), "not a directory\n");
});

describe("1. no output is an input, compared by file identity", () => {
  it("scan --out onto the strain reached through a symbolic link", () => {
    expectRefused(["scan", "l.f64", ...SEARCH, "--out", "ok.f64"], /^chirpsieve: --out: ok\.f64 is the same file as the input l\.f64 \(strain file\); writing there would destroy it$/);
  });

  it("scan --shard does not skip the guard", () => {
    expectRefused(["scan", "ok.f64", ...SEARCH, "--shard", "0/1", "--out", "ok.f64"], /--out: ok\.f64 is also an input \(strain file\)/);
  });

  it("scan --out onto the raw file's sidecar", () => {
    expectRefused(["scan", "ok.f64", ...SEARCH, "--out", "ok.f64.json"], /--out: ok\.f64\.json is also an input \(strain file\)/);
  });

  it("a hard link to the strain is the same file", () => {
    linkSync(at("ok.f64"), at("hard.f64"));
    try {
      expectRefused(["psd", "ok.f64", "--out", "hard.f64"], /--out: hard\.f64 is the same file as the input ok\.f64/);
    } finally {
      rmSync(at("hard.f64"));
    }
  });

  it("noise-curve tables are inputs: bank, scan, recover, simulate", () => {
    expectRefused(["bank", "--mass-range", "8:12", "--fmin", "40", "--noise-curve", "c.txt", "--out", "c.txt"], /--out: c\.txt is also an input \(--noise-curve\)/);
    expectRefused(["scan", "ok.f64", ...SEARCH, "--noise-curve", "c.txt", "--out", "c.txt"], /--out: c\.txt is also an input \(--noise-curve\)/);
    expectRefused(["recover", "--noise-curve", "c.txt", "--count", "2", "--snr-range", "8:10", "--report", "c.txt"], /--report: c\.txt is also an input \(--noise-curve\)/);
    expectRefused(["simulate", "--duration", "4", "--rate", "512", "--noise-curve", "c.txt", "--out", "n.f32", "--manifest", "c.txt"], /--manifest: c\.txt is also an input \(--noise-curve\)/);
  });

  it("merge --out onto one of the shards", () => {
    expectRefused(["merge", "sh", "--out", "sh/part-0.jsonl"], /--out: sh\/part-0\.jsonl is also an input \(shard record file\)/);
    expectRefused(["merge", "sh", "--out", "sh/part-1.manifest.json"], /--out: sh\/part-1\.manifest\.json is also an input \(shard manifest\)/);
  });

  it("two outputs of one command may not share a file", () => {
    expectRefused(["simulate", "--duration", "4", "--rate", "512", "--out", "s.f32", "--manifest", "s.f32"], /^chirpsieve: --manifest: s\.f32 is also the --out output; give each output its own file$/);
    expectRefused(["simulate", "--duration", "4", "--rate", "512", "--out", "s.f32", "--manifest", "s.f32.json"], /--manifest: s\.f32\.json is also the --out output/);
    expectRefused(["recover", "--noise-curve", "ajith2011", "--count", "2", "--snr-range", "8:10", "--out", "r", "--report", "r"], /--report: r is also the --out output/);
  });
});

describe("4. outputs through links and onto special files", () => {
  it("writes through a link to a regular file: the link stays, its target gets the output", () => {
    writeFileSync(at("target.jsonl"), "old\n");
    symlinkSync("target.jsonl", at("via-link.jsonl"));
    try {
      const r = runCli(["scan", "ok.f64", ...SEARCH, "--out", "via-link.jsonl"], { cwd: dir });
      expect(r.code, r.stderr).toBe(0);
      expect(lstatSync(at("via-link.jsonl")).isSymbolicLink()).toBe(true);
      expect(readFileSync(at("target.jsonl"), "utf8")).toMatch(/"type":"summary"/);
    } finally {
      rmSync(at("via-link.jsonl"));
      rmSync(at("target.jsonl"));
    }
  });

  it("refuses /dev paths and FIFOs for outputs written by rename", () => {
    expectRefused(["scan", "ok.f64", ...SEARCH, "--out", "/dev/stdout"], /^chirpsieve: --out: \/dev\/stdout: a device or system file; outputs are written to regular files only/);
    expectRefused(["psd", "ok.f64", "--out", "/dev/null"], /--out: \/dev\/null: a device or system file/);
    symlinkSync("/dev/null", at("null-link"));
    try {
      expectRefused(["psd", "ok.f64", "--out", "null-link"], /--out: null-link: links to \/dev\/null, a device or system file/);
    } finally {
      rmSync(at("null-link"));
    }
    const fifo = spawnSync("mkfifo", [at("fifo")]);
    if (fifo.status === 0) {
      try {
        expectRefused(["psd", "ok.f64", "--out", "fifo"], /--out: fifo: a device, FIFO or other special file/);
      } finally {
        rmSync(at("fifo"));
      }
    }
  });
});

describe("5. stale temporary files of killed writes", () => {
  it("are removed by the next run for the same output; a live writer's are kept", () => {
    const stale = `.cands.jsonl.${deadPid()}.1700000000000-0.partial`;
    const live = `.cands.jsonl.${process.pid}.1700000000000-0.partial`;
    const otherOutput = `.other.jsonl.${deadPid()}.1700000000000-0.partial`;
    for (const f of [stale, live, otherOutput]) writeFileSync(at(f), "half a file");
    try {
      const r = runCli(["scan", "ok.f64", ...SEARCH, "--out", "cands.jsonl"], { cwd: dir });
      expect(r.code, r.stderr).toBe(0);
      expect(existsSync(at(stale))).toBe(false);
      expect(existsSync(at(live))).toBe(true); // its process (this test) is alive
      expect(existsSync(at(otherOutput))).toBe(true); // not this run's output
    } finally {
      for (const f of [stale, live, otherOutput, "cands.jsonl"]) rmSync(at(f), { force: true });
    }
  });
});

describe("6. the same input twice", () => {
  it("scan FILE FILE, a file and a link to it, two sites on one file, recover --strain twice", () => {
    expectRefused(["scan", "ok.f64", "ok.f64", ...SEARCH], /^chirpsieve: strain file: ok\.f64 is given twice; each input may appear once/);
    expectRefused(["scan", "ok.f64", "l.f64", ...SEARCH], /strain file: ok\.f64 and l\.f64 are the same file/);
    expectRefused(["scan", "--site", "site-a=ok.f64", "--site", "site-b=ok.f64", ...SEARCH], /^chirpsieve: --site: site-a=ok\.f64 and site-b=ok\.f64 are the same file/);
    expectRefused(["scan", "--site", "site-a=ok.f64", "--site", "site-b=l.f64", ...SEARCH], /--site: site-a=ok\.f64 and site-b=l\.f64 are the same file/);
    expectRefused(["recover", "--strain", "ok.f64", "l.f64", "--count", "2", "--snr-range", "8:10", ...SEARCH], /--strain: ok\.f64 and l\.f64 are the same file/);
  });
});

describe("12. merge reads only the shard files in the folder it is given", () => {
  function shardCopy(name: string, edit: (manifest: Record<string, unknown>) => void): void {
    mkdirSync(at(name));
    for (const i of [0, 1]) {
      copyFileSync(at(`sh/part-${i}.jsonl`), at(`${name}/part-${i}.jsonl`));
      const m = JSON.parse(readFileSync(at(`sh/part-${i}.manifest.json`), "utf8"));
      if (i === 0) edit(m);
      writeFileSync(at(`${name}/part-${i}.manifest.json`), JSON.stringify(m));
    }
  }

  it("refuses a record path leading out of the folder, to a device or through a link", () => {
    shardCopy("m-up", (m) => (m.candidates = "../../../../dev/zero"));
    expectRefused(["merge", "m-up"], /^chirpsieve: merge: m-up\/part-0\.manifest\.json: candidates "\.\.\/\.\.\/\.\.\/\.\.\/dev\/zero" is not a file name in the manifest's folder$/);
    shardCopy("m-out", (m) => (m.candidates = "../sh/part-0.jsonl"));
    expectRefused(["merge", "m-out"], /candidates "\.\.\/sh\/part-0\.jsonl" is not a file name in the manifest's folder/);
    shardCopy("m-dev", (m) => (m.candidates = "zero.jsonl"));
    symlinkSync("/dev/zero", at("m-dev/zero.jsonl"));
    expectRefused(["merge", "m-dev"], /merge: m-dev\/zero\.jsonl: a symbolic link; a shard's candidate file must be a regular file/);
  });

  it("refuses a record file whose size or hash differs from what its manifest records", () => {
    shardCopy("m-size", (m) => (m.candidatesBytes = (m.candidatesBytes as number) + 1));
    expectRefused(["merge", "m-size"], /merge: m-size\/part-0\.jsonl: \d+ bytes, but its manifest records \d+: the file changed or was cut short; rerun shard 0\/2/);
    shardCopy("m-hash", (m) => (m.candidatesSha256 = "0".repeat(64)));
    expectRefused(["merge", "m-hash"], /merge: m-hash\/part-0\.jsonl: its SHA-256 differs from the one its manifest records/);
    shardCopy("m-huge", (m) => (m.candidatesBytes = 2 ** 40));
    expectRefused(["merge", "m-huge"], /merge: m-huge\/part-0\.manifest\.json: records a candidate file of 1099511627776 bytes, more than the \d+ a shard's records can take/);
    shardCopy("m-none", (m) => delete m.candidatesSha256);
    expectRefused(["merge", "m-none"], /records no size and SHA-256 of its candidate file/);
  });

  it("refuses a manifest that is a device", () => {
    mkdirSync(at("m-devman"));
    symlinkSync("/dev/zero", at("m-devman/part-0.manifest.json"));
    expectRefused(["merge", "m-devman"], /merge: m-devman\/part-0\.manifest\.json: not a regular file/);
  });
});

describe("13. every output checked before any work", () => {
  it("a directory name, a missing directory, an existing directory, a file as directory", () => {
    expectRefused(["scan", "ok.f64", ...SEARCH, "--out", "newdir/"], /^chirpsieve: --out: newdir\/ names a directory; give a file name$/);
    expectRefused(["scan", "ok.f64", ...SEARCH, "--out", "newdir/x.jsonl"], /^chirpsieve: --out: directory newdir does not exist$/);
    expectRefused(["scan", "ok.f64", ...SEARCH, "--shard", "0/1", "--out", "existing_dir"], /^chirpsieve: --out: existing_dir: is a directory; give a file name$/);
    expectRefused(["scan", "ok.f64", ...SEARCH, "--out", "afile/x"], /^chirpsieve: --out: afile is a file, not a directory$/);
    expectRefused(["scan", "ok.f64", ...SEARCH, "--shard", "0/1", "--out", "afile/x/part-0.jsonl"], /--out: cannot create directory afile\/x: .*afile is a file/);
    expectRefused(["psd", "ok.f64", "--plot", "newdir/p.svg"], /^chirpsieve: --plot: directory newdir does not exist$/);
    expectRefused(["scan", "ok.f64", ...SEARCH, "--plot", "afile"], /^chirpsieve: --plot: afile exists and is not a directory$/);
    expectRefused(["recover", "--noise-curve", "ajith2011", "--count", "2", "--snr-range", "8:10", "--report", "newdir/r.html"], /--report: directory newdir does not exist/);
    expectRefused(["bank", "--mass-range", "8:12", "--fmin", "40", "--out", "existing_dir"], /--out: existing_dir: is a directory/);
    expectRefused(["merge", "sh", "--out", "newdir/m.jsonl"], /--out: directory newdir does not exist/);
  });

  it.skipIf(process.getuid?.() === 0)("an unwritable directory (not as root, who may write anywhere)", () => {
    mkdirSync(at("ro"));
    chmodSync(at("ro"), 0o555);
    try {
      expectRefused(["scan", "ok.f64", ...SEARCH, "--out", "ro/x.jsonl"], /^chirpsieve: --out: directory ro is not writable$/);
    } finally {
      chmodSync(at("ro"), 0o755);
      rmSync(at("ro"), { recursive: true });
    }
  });
});
