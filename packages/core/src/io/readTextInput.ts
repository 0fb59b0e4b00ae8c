import { readFileSync, statSync } from "node:fs";
import { InputError } from "../errors.js";

/**
 * Reads a small text input the user named (a bank, sites, injections or a PSD table) as UTF-8,
 * turning file-system failures into one-line InputErrors that name the path.
 */
export function readTextInput(path: string, what = "file"): string {
  let stat;
  try {
    stat = statSync(path);
  } catch {
    throw new InputError(`${path}: no such ${what}`);
  }
  if (stat.isDirectory()) throw new InputError(`${path}: is a directory, expected a ${what}`);
  try {
    return readFileSync(path, "utf8");
  } catch (err) {
    throw new InputError(`${path}: cannot be read (${(err as NodeJS.ErrnoException).code ?? (err as Error).message})`);
  }
}
