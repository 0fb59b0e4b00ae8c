import type { Command } from "commander";

/** Registers `chirpsieve bank` (not implemented yet). */
export function registerBank(_program: Command): void {}
