import { InputError } from "../errors.js";
import { loadPffft, pffftLoaded, pffftLoadFailure } from "./pffft.js";
import type { FftBackendChoice, FftBackendName } from "./types.js";

/**
 * Loads every FFT backend that needs loading (today: the pffft WebAssembly module), once per
 * thread. Idempotent and safe to call concurrently; it never rejects — a backend that fails to
 * load is left out of {@link availableFftBackends}. Each worker thread must call it itself.
 */
export async function loadFftBackends(): Promise<void> {
  await loadPffft();
}

/** Backends usable now on this thread, fastest first ("fftjs" is always available). */
export function availableFftBackends(): FftBackendName[] {
  return pffftLoaded() ? ["pffft", "fftjs"] : ["fftjs"];
}

/**
 * Turns a backend choice into a usable backend name: "auto" is "pffft" when it has loaded on this
 * thread, else "fftjs"; a named backend must be available (call loadFftBackends() first).
 */
export function resolveFftBackend(choice: FftBackendChoice): FftBackendName {
  switch (choice) {
    case "auto":
      return pffftLoaded() ? "pffft" : "fftjs";
    case "fftjs":
      return "fftjs";
    case "pffft":
      if (pffftLoaded()) return "pffft";
      {
        const failure = pffftLoadFailure();
        throw new InputError(
          failure === undefined
            ? `FFT backend "pffft" is not loaded on this thread; await loadFftBackends() first`
            : `FFT backend "pffft" could not be loaded: ${failure}`,
        );
      }
    default:
      throw new InputError(`FFT backend must be "auto", "pffft" or "fftjs" (got ${JSON.stringify(choice)})`);
  }
}
