// A growing column of float64 values kept in bounded memory: beyond one block it goes to disk.
import { closeSync, openSync, readSync, unlinkSync, writeSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";

/** Values held in memory before a block is written out (512 KiB). */
const BLOCK = 1 << 16;

let spillCounter = 0;

/**
 * An append-only column of float64 values with random-access reads. The first block stays in memory;
 * once it fills, blocks go to an anonymous temporary file (created in the system's temporary folder
 * and unlinked at once, so nothing is left behind even if the process is killed). Memory is one
 * block whatever the length. Internal to the text reader.
 */
export class Float64Spill {
  private block = new Float64Array(BLOCK);
  private filled = 0;
  private flushed = 0;
  private fd = -1;

  /** Number of values appended. */
  get length(): number {
    return this.flushed + this.filled;
  }

  push(x: number): void {
    if (this.filled === BLOCK) this.flush();
    this.block[this.filled++] = x;
  }

  /** Values [offset, offset + count) as a new array (the caller checks the range). */
  read(offset: number, count: number): Float64Array {
    const out = new Float64Array(count);
    let at = 0;
    if (offset < this.flushed) {
      const fromFile = Math.min(count, this.flushed - offset);
      const bytes = new Uint8Array(out.buffer, 0, 8 * fromFile);
      let got = 0;
      while (got < bytes.length) {
        const n = readSync(this.fd, bytes, got, bytes.length - got, 8 * offset + got);
        if (n <= 0) throw new Error("temporary column ended early");
        got += n;
      }
      at = fromFile;
    }
    if (at < count) out.set(this.block.subarray(offset + at - this.flushed, offset + count - this.flushed), at);
    return out;
  }

  /** Value i. */
  at(i: number): number {
    return i >= this.flushed ? this.block[i - this.flushed] : this.read(i, 1)[0];
  }

  /** Releases the temporary file. */
  close(): void {
    if (this.fd >= 0) closeSync(this.fd);
    this.fd = -1;
  }

  private flush(): void {
    if (this.fd < 0) {
      const path = join(tmpdir(), `.chirpsieve-column-${process.pid}-${Date.now()}-${spillCounter++}.partial`);
      this.fd = openSync(path, "wx+", 0o600);
      try {
        unlinkSync(path);
      } catch {
        // Where an open file cannot be unlinked it is removed at close instead (not on Linux).
      }
    }
    const bytes = new Uint8Array(this.block.buffer, 0, 8 * this.filled);
    let put = 0;
    while (put < bytes.length) put += writeSync(this.fd, bytes, put, bytes.length - put, 8 * this.flushed + put);
    this.flushed += this.filled;
    this.filled = 0;
  }
}
