import type { Command } from "commander";

/** Registers `chirpsieve simulate` (not implemented yet). */
export function registerSimulate(_program: Command): void {}
