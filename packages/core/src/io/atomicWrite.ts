import { closeSync, fsyncSync, openSync, renameSync, rmSync, statSync, writeSync } from "node:fs";
import { InputError } from "../errors.js";
import { basename, dirname, join } from "node:path";

/**
 * Writes `content` (bytes, a string, or pieces of either) to `path` so that a reader never sees a partial file: the bytes go to a
 * temporary file in the same directory, are flushed, and the file is then renamed over `path`
 * (rename is atomic within one file system). On failure the temporary file is removed, and a
 * file-system error names `path`, not the temporary file. Only regular files are replaced: a
 * directory, device or other special file at `path` is an InputError.
 */
export function writeFileAtomic(path: string, content: string | Uint8Array | Iterable<string | Uint8Array>): void {
  let existing;
  try {
    existing = statSync(path);
  } catch {
    existing = undefined;
  }
  if (existing && !existing.isFile()) {
    throw new InputError(`${path}: exists and is not a regular file (${existing.isDirectory() ? "a directory" : "a device or special file"}); give a file name`);
  }
  const tmp = join(dirname(path), `.${basename(path)}.${process.pid}.${Date.now()}.partial`);
  let fd = -1;
  try {
    fd = openSync(tmp, "w");
    // Pieces (an iterable) are written as they come, so a large file is never one string in memory.
    const pieces = typeof content === "string" || content instanceof Uint8Array ? [content] : content;
    for (const piece of pieces) {
      const bytes = typeof piece === "string" ? Buffer.from(piece, "utf8") : piece;
      let off = 0;
      while (off < bytes.length) off += writeSync(fd, bytes, off, bytes.length - off);
    }
    fsyncSync(fd);
    closeSync(fd);
    fd = -1;
    renameSync(tmp, path);
  } catch (err) {
    if (fd >= 0) closeSync(fd);
    rmSync(tmp, { force: true });
    if (err && typeof err === "object" && "path" in err) (err as { path: string }).path = path;
    throw err;
  }
}
