import type { Command } from "commander";

/** Registers `chirpsieve source` (not implemented yet). */
export function registerSource(_program: Command): void {}
