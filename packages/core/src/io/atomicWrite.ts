import { closeSync, fsyncSync, openSync, renameSync, rmSync, writeSync } from "node:fs";
import { basename, dirname, join } from "node:path";

/**
 * Writes `content` to `path` so that a reader never sees a partial file: the bytes go to a
 * temporary file in the same directory, are flushed, and the file is then renamed over `path`
 * (rename is atomic within one file system). On failure the temporary file is removed.
 */
export function writeFileAtomic(path: string, content: string | Uint8Array): void {
  const tmp = join(dirname(path), `.${basename(path)}.${process.pid}.${Date.now()}.partial`);
  let fd = -1;
  try {
    fd = openSync(tmp, "w");
    const bytes = typeof content === "string" ? Buffer.from(content, "utf8") : content;
    let off = 0;
    while (off < bytes.length) off += writeSync(fd, bytes, off, bytes.length - off);
    fsyncSync(fd);
    closeSync(fd);
    fd = -1;
    renameSync(tmp, path);
  } catch (err) {
    if (fd >= 0) closeSync(fd);
    rmSync(tmp, { force: true });
    throw err;
  }
}
