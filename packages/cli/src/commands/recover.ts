import type { Command } from "commander";

/** Registers `chirpsieve recover` (not implemented yet). */
export function registerRecover(_program: Command): void {}
