import cliProgress from "cli-progress";

/** Progress of a long run on stderr: a bar on a terminal, periodic lines otherwise (if asked for). */
export interface Progress {
  update(fileIndex: number, files: number, done: number, total: number): void;
  stop(): void;
}

/** Where and how often progress is written (injectable for tests). */
export interface ProgressOptions {
  /** Without a terminal, log periodic lines (default false: nothing without a terminal). */
  lines?: boolean;
  /** Least time between two logged lines, ms (default 5000). */
  intervalMs?: number;
  /** Clock in ms (default performance.now). */
  now?: () => number;
  /** Output stream (default process.stderr). */
  stream?: { write(text: string): unknown; isTTY?: boolean };
  /** What is counted (default "segments"; e.g. "draws"). */
  unit?: string;
}

/** Least time between two progress lines without a terminal (ms). */
export const PROGRESS_LINE_INTERVAL_MS = 5000;

/**
 * A progress report for `label` work over segments (or another `unit`) of one or more files. On a terminal: a bar.
 * Otherwise, with `lines`: one line `chirpsieve: LABEL D/T segments, P%, M:SS elapsed` (with
 * `file I/N` before it when there are several files) at the first update and then at most one per
 * interval, so batch logs show the run advancing. Nothing when not wanted (--quiet).
 */
export function createProgress(wanted: boolean, label: string, options: ProgressOptions = {}): Progress {
  const stream = options.stream ?? process.stderr;
  if (!wanted) return { update() {}, stop() {} };
  if (!stream.isTTY) return options.lines ? progressLines(label, stream, options) : { update() {}, stop() {} };
  const bar = new cliProgress.SingleBar(
    { stream: stream as NodeJS.WriteStream, format: `${label} {file} [{bar}] {percentage}% | {value}/{total} ${options.unit ?? "segments"} | eta {eta_formatted}`, hideCursor: true, clearOnComplete: true },
    cliProgress.Presets.shades_classic,
  );
  let started = false;
  let lastFile = -1;
  return {
    update(fileIndex, files, done, total) {
      if (!started || fileIndex !== lastFile) {
        if (started) bar.stop();
        bar.start(total, 0, { file: `${fileIndex + 1}/${files}` });
        started = true;
        lastFile = fileIndex;
      }
      bar.update(done, { file: `${fileIndex + 1}/${files}` });
    },
    stop() {
      if (started) bar.stop();
    },
  };
}

function progressLines(label: string, stream: { write(text: string): unknown }, options: ProgressOptions): Progress {
  const now = options.now ?? (() => performance.now());
  const interval = options.intervalMs ?? PROGRESS_LINE_INTERVAL_MS;
  const start = now();
  let last = -Infinity;
  return {
    update(fileIndex, files, done, total) {
      const t = now();
      if (t - last < interval) return;
      last = t;
      const pct = total > 0 ? Math.floor((100 * done) / total) : 100;
      const file = files > 1 ? ` file ${fileIndex + 1}/${files},` : "";
      stream.write(`chirpsieve: ${label}${file} ${done}/${total} ${options.unit ?? "segments"}, ${pct}%, ${clock((t - start) / 1000)} elapsed\n`);
    },
    stop() {},
  };
}

/** Seconds as M:SS (or H:MM:SS from an hour on). */
function clock(seconds: number): string {
  const s = Math.floor(seconds);
  const h = Math.floor(s / 3600);
  const m = Math.floor((s % 3600) / 60);
  const ss = String(s % 60).padStart(2, "0");
  return h > 0 ? `${h}:${String(m).padStart(2, "0")}:${ss}` : `${m}:${ss}`;
}
