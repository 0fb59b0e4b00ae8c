import type { Command } from "commander";

/** Registers `chirpsieve psd` (not implemented yet). */
export function registerPsd(_program: Command): void {}
