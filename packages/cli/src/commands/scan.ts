import type { Command } from "commander";

/** Registers `chirpsieve scan` (not implemented yet). */
export function registerScan(_program: Command): void {}
