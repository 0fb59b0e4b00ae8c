/**
 * Test hook for kill tests: when the environment variable CHIRPSIEVE_CRASH_AT equals `label`, the
 * process kills itself with SIGKILL on the spot (no clean-up, no exit handlers), as a power cut or
 * `kill -9` would. Unset, it does nothing.
 */
export function crashPoint(label: string): void {
  if (process.env.CHIRPSIEVE_CRASH_AT === label) process.kill(process.pid, "SIGKILL");
}
