import cliProgress from "cli-progress";

/** A progress bar on stderr, shown only when stderr is a terminal and it is wanted. */
export interface Progress {
  update(fileIndex: number, files: number, done: number, total: number): void;
  stop(): void;
}

export function createProgress(wanted: boolean, label: string): Progress {
  if (!wanted || !process.stderr.isTTY) return { update() {}, stop() {} };
  const bar = new cliProgress.SingleBar(
    { stream: process.stderr, format: `${label} {file} [{bar}] {percentage}% | {value}/{total} segments | eta {eta_formatted}`, hideCursor: true, clearOnComplete: true },
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
