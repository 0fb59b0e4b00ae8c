#!/usr/bin/env node
import { Command, CommanderError } from "commander";
import { InputError } from "@chirpsieve/core";
import { describeFsError, isInputError, refuseEmptyPaths } from "./errors.js";
import { describeInputError } from "./parameterFlags.js";
import { registerSource } from "./commands/source.js";
import { registerPsd } from "./commands/psd.js";
import { registerSimulate } from "./commands/simulate.js";
import { registerScan } from "./commands/scan.js";
import { registerBank } from "./commands/bank.js";
import { registerRecover } from "./commands/recover.js";
import { registerSites } from "./commands/sites.js";
import { registerMerge } from "./commands/merge.js";
import { VERSION } from "./version.js";

/** Builds the command tree. Each subcommand lives in commands/<name>.ts. */
export function buildProgram(): Command {
  const program = new Command();
  program
    .name("chirpsieve")
    .description(
      "Find compact-binary inspiral chirps in gravitational-wave strain: scan files, build and verify " +
        "template banks, simulate data, run injection-recovery campaigns, describe a binary source. " +
        "A reported chirp is a candidate, not a detection.",
    )
    .version(VERSION)
    .showHelpAfterError(false)
    .exitOverride()
    .configureOutput({ outputError: () => {} });
  program.hook("preAction", (_program, action) => refuseEmptyPaths(action));
  registerSource(program);
  registerPsd(program);
  registerSimulate(program);
  registerScan(program);
  registerBank(program);
  registerRecover(program);
  registerSites(program);
  registerMerge(program);
  for (const sub of program.commands) {
    sub.exitOverride().configureOutput({ outputError: () => {} });
    for (const subsub of sub.commands) subsub.exitOverride().configureOutput({ outputError: () => {} });
  }
  return program;
}

function fail(message: string, code: number): never {
  process.stderr.write(`chirpsieve: ${message.split("\n")[0]}\n`);
  process.exit(code);
}

async function main(argv: string[]): Promise<void> {
  const program = buildProgram();
  try {
    await program.parseAsync(argv);
  } catch (err) {
    if (err instanceof CommanderError) {
      if (err.exitCode === 0 || err.code === "commander.helpDisplayed" || err.code === "commander.version") {
        process.exit(0);
      }
      fail(err.message.replace(/^error: /, ""), 2);
    }
    if (err instanceof InputError) fail(describeInputError(err), 2);
    if (isInputError(err)) fail(describeFsError(err), 2);
    if (process.env.CHIRPSIEVE_DEBUG === "1") process.stderr.write(`${(err as Error)?.stack ?? err}\n`);
    fail(`unexpected error: ${(err as Error)?.message ?? String(err)} (set CHIRPSIEVE_DEBUG=1 for details)`, 1);
  }
}

// A reader that closes the pipe early (`chirpsieve scan … | head`) is not an error.
process.stdout.on("error", (err: NodeJS.ErrnoException) => {
  if (err.code === "EPIPE") process.exit(0);
  fail(`cannot write to standard output: ${err.message}`, 1);
});

await main(process.argv);
