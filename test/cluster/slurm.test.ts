// Integration with a real batch scheduler: a 4-task Slurm job array scans one synthetic strain file
// with `chirpsieve scan --shard auto/4` (the index from SLURM_ARRAY_TASK_ID), then `chirpsieve merge`
// puts the shards together and the result is compared with an unsharded scan.
// Needs a running one-node cluster: as root, `apt-get install -y slurmd slurmctld munge` and
// `bash test/cluster/slurm-up.sh` (CI does both in .ci/run). Outside CI the test is skipped when
// Slurm is absent; under CI=true its absence fails.
import { spawnSync } from "node:child_process";
import { mkdirSync, readdirSync, readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { ajith2011, colouredNoise, writeStrain } from "@chirpsieve/core";
import { injectInto } from "../../packages/core/src/inject/injection.js";
import { SITE_A } from "../../packages/core/src/waveform/antenna.js";
import { CLI, runCli } from "../cli/helpers.js";
import { injectionAt } from "../search/fixtures.js";
import { tempDir } from "../shard/fixtures.js";

const CI = process.env.CI === "true";
const SLURM_UP = fileURLToPath(new URL("./slurm-up.sh", import.meta.url));
const HOW = "as root: apt-get install -y slurmd slurmctld munge && bash test/cluster/slurm-up.sh, then rerun";

function run(cmd: string, args: string[], timeoutMs = 30_000) {
  const r = spawnSync(cmd, args, { encoding: "utf8", timeout: timeoutMs });
  return { ok: !r.error && r.status === 0, code: r.status, stdout: r.stdout ?? "", stderr: r.stderr ?? "", error: r.error };
}

/** Why the test cannot run here, or "" when a cluster answers (started with slurm-up.sh when it is installed but down). */
function slurmProblem(): string {
  if (run("sbatch", ["--version"]).error) return "Slurm is not installed (no sbatch)";
  const idle = () => /idle|mixed|allocated|completing/.test(run("sinfo", ["-h", "-o", "%T"], 15_000).stdout);
  if (idle()) return "";
  if (process.getuid?.() === 0) {
    const up = run("bash", [SLURM_UP], 90_000);
    if (up.ok && idle()) return "";
    return `slurm-up.sh could not start the cluster: ${(up.stderr || up.stdout).trim().split("\n").pop()}`;
  }
  return "no Slurm node is up and this is not root (cannot run slurm-up.sh)";
}

const problem = slurmProblem();
const skip = problem !== "";
if (skip && !CI) console.warn(`test/cluster/slurm.test.ts: skipped: ${problem}. To run it, ${HOW}.`);

describe.skipIf(skip && !CI)("a Slurm job array scans shards that merge to the unsharded result", () => {
  const dir = tempDir("slurm");

  it("4 array tasks with --shard auto/4, merged: the same candidate lines as one unsharded scan", async () => {
    expect(problem, `${problem}; ${HOW}`).toBe("");
    const strain = join(dir, "synthetic.f64");
    const shards = join(dir, "shards");
    const logs = join(dir, "logs");
    mkdirSync(shards);
    mkdirSync(logs);
    // Invented scenario: 48 s of seeded noise at 1024 Hz with a 10+8 M_sun chirp at t = 25.3 s.
    const fs = 1024;
    const data = colouredNoise(ajith2011, 48 * fs, fs, "slurm-array");
    injectInto(data, fs, 0, { ...injectionAt(10, 8, 25.3), distanceMpc: 70 }, SITE_A, 40);
    await writeStrain(strain, { data, sampleRate: fs, startTime: 0 });
    const scan = ["scan", strain, "--mass-range", "8:12", "--fmin", "40", "--min-snr", "5", "--loudest-within", "0.4", "--welch-segment", "2", "--segment", "8", "--quiet"];
    const quote = (s: string) => `'${s.replace(/'/g, `'\\''`)}'`;
    const script = [
      "#!/bin/bash",
      "#SBATCH --job-name=chirpsieve-test",
      "#SBATCH --array=0-3",
      "#SBATCH --ntasks=1",
      "#SBATCH --cpus-per-task=1",
      "#SBATCH --time=00:05:00",
      `#SBATCH --output=${logs}/task-%a.log`,
      "set -euo pipefail",
      `exec ${quote(process.execPath)} ${quote(CLI)} ${scan.map(quote).join(" ")} --shard auto/4 --out ${quote(shards)}/part-$SLURM_ARRAY_TASK_ID.jsonl`,
      "",
    ].join("\n");
    const scriptPath = join(dir, "scan-array.sh");
    writeFileSync(scriptPath, script);
    const submitted = run("sbatch", ["--parsable", scriptPath]);
    expect(submitted.ok, `sbatch failed (${submitted.code}): ${submitted.stderr.trim()}`).toBe(true);
    const jobId = submitted.stdout.trim().split(";")[0];
    // Wait (≤ 100 s) until the array has left the queue; a transient squeue failure just retries.
    const deadline = Date.now() + 100_000;
    for (;;) {
      const q = run("squeue", ["-h", "-j", jobId, "-o", "%i %T"]);
      if (q.ok && q.stdout.trim() === "") break;
      if (Date.now() > deadline) throw new Error(`job ${jobId} still queued after 100 s: ${q.stdout.trim()}`);
      await new Promise((r) => setTimeout(r, 500));
    }
    const taskLogs = readdirSync(logs)
      .map((f) => `${f}: ${readFileSync(join(logs, f), "utf8").trim()}`)
      .join(" | ");
    const manifests = readdirSync(shards).filter((f) => f.endsWith(".manifest.json")).sort();
    expect(manifests, `task logs: ${taskLogs}`).toEqual([0, 1, 2, 3].map((i) => `part-${i}.manifest.json`));
    const merged = runCli(["merge", shards, "--json"]);
    expect(merged.code, merged.stderr).toBe(0);
    const single = runCli([...scan, "--json"]);
    const candidates = (text: string) => text.split("\n").filter((l) => l.startsWith('{"type":"candidate"'));
    expect(candidates(single.stdout).length).toBeGreaterThan(2);
    expect(single.code, single.stderr).toBe(0);
    expect(candidates(merged.stdout)).toEqual(candidates(single.stdout));
    expect(JSON.parse(merged.stdout.trim().split("\n").pop()!)).toMatchObject({ shards: 4, shardBy: "both" });
  }, 115_000);
});
