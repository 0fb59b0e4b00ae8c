import { spawnSync } from "node:child_process";
import { fileURLToPath } from "node:url";

/** Absolute path of the built CLI entry point (npm test builds it first via `pretest`). */
export const CLI = fileURLToPath(new URL("../../packages/cli/dist/main.js", import.meta.url));

export interface CliResult {
  code: number;
  stdout: string;
  stderr: string;
}

/** Runs `chirpsieve ARGS…` in a child process and captures its output. */
export function runCli(args: string[], options: { cwd?: string; env?: NodeJS.ProcessEnv; timeoutMs?: number } = {}): CliResult {
  const r = spawnSync(process.execPath, [CLI, ...args], {
    cwd: options.cwd,
    env: { ...process.env, ...options.env },
    encoding: "utf8",
    timeout: options.timeoutMs ?? 120_000,
  });
  return { code: r.status ?? -1, stdout: r.stdout ?? "", stderr: r.stderr ?? "" };
}
