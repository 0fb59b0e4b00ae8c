// Progress without a terminal: periodic lines, at most one per interval (a fake clock, no timing).
import { describe, expect, it } from "vitest";
import { createProgress } from "../../packages/cli/src/progress.js";

function fake(interval: number) {
  let t = 0;
  const written: string[] = [];
  const stream = { isTTY: false, write: (s: string) => written.push(s) };
  return { written, stream, advance: (ms: number) => (t += ms), now: () => t, interval };
}

describe("progress lines without a terminal", () => {
  it("writes the first update, then at most one line per interval", () => {
    const f = fake(1000);
    const p = createProgress(true, "scan", { lines: true, intervalMs: f.interval, now: f.now, stream: f.stream });
    p.update(0, 1, 1, 40); // t = 0: written
    f.advance(400);
    p.update(0, 1, 2, 40); // 0.4 s: too soon
    f.advance(700);
    p.update(0, 1, 12, 40); // 1.1 s: written
    f.advance(999);
    p.update(0, 1, 13, 40); // 2.099 s: 0.999 s after the last line, too soon
    f.advance(41_000);
    p.update(1, 2, 40, 40); // 43.1 s: written, with the file
    p.stop();
    expect(f.written).toEqual([
      "chirpsieve: scan 1/40 segments, 2%, 0:00 elapsed\n",
      "chirpsieve: scan 12/40 segments, 30%, 0:01 elapsed\n",
      "chirpsieve: scan file 2/2, 40/40 segments, 100%, 0:43 elapsed\n",
    ]);
  });

  it("writes nothing when not wanted (--quiet) or when lines were not asked for", () => {
    const f = fake(0);
    createProgress(false, "scan", { lines: true, intervalMs: 0, now: f.now, stream: f.stream }).update(0, 1, 1, 2);
    createProgress(true, "scan", { intervalMs: 0, now: f.now, stream: f.stream }).update(0, 1, 1, 2);
    expect(f.written).toEqual([]);
  });
});
