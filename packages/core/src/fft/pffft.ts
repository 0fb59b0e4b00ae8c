import { InputError } from "../errors.js";
import type { ComplexFft, ComplexPlan, RealFft, RealPlan } from "./types.js";

/**
 * Single-precision FFTs backed by PFFFT (J. Pommier's SIMD adaptation of FFTPACK v4), compiled to
 * WebAssembly with 128-bit SIMD in @echogarden/pffft-wasm ("simd" build).
 *
 * Memory: every buffer lives in the module's WebAssembly memory, which grows (and detaches every
 * earlier Float32Array view of it, which then reads as length 0) whenever a new setup or buffer is
 * allocated on this thread. So this file never keeps a view across an allocation: the copy API
 * reads `module.HEAPF32` (which the Emscripten glue replaces after growth) on every call, and the
 * plans' `input`/`output` getters rebuild their view when the heap's ArrayBuffer has changed.
 * Transforms themselves never allocate (a `work` buffer is always passed, never the stack).
 *
 * Sizes: PFFFT needs N to be a multiple of 16 for complex and 32 for real transforms (and
 * N = 2^a 3^b 5^c); chirpsieve keeps to powers of two, so complex N ≥ 16 and real N ≥ 32. A size
 * PFFFT rejects by assertion aborts the whole module, hence the checks here before every setup.
 */

/** The part of the Emscripten module of @echogarden/pffft-wasm that chirpsieve uses. */
interface PffftModule {
  HEAPF32: Float32Array;
  _pffft_new_setup(n: number, transform: number): number;
  _pffft_destroy_setup(setup: number): void;
  _pffft_transform(setup: number, input: number, output: number, work: number, direction: number): void;
  _pffft_transform_ordered(setup: number, input: number, output: number, work: number, direction: number): void;
  _pffft_zreorder(setup: number, input: number, output: number, direction: number): void;
  _pffft_zconvolve_accumulate(setup: number, a: number, b: number, ab: number, scaling: number): void;
  _pffft_aligned_malloc(bytes: number): number;
  _pffft_aligned_free(ptr: number): void;
  _pffft_simd_size(): number;
}

type PffftFactory = (options?: Record<string, unknown>) => Promise<PffftModule>;

// PFFFT's enums: pffft_direction_t {FORWARD, BACKWARD}, pffft_transform_t {REAL, COMPLEX}.
const FORWARD = 0;
const BACKWARD = 1;
const REAL = 0;
const COMPLEX = 1;
const MIN_COMPLEX = 16;
const MIN_REAL = 32;

let wasm: PffftModule | undefined;
let loading: Promise<void> | undefined;
let loadFailure: string | undefined;

/**
 * Loads the WebAssembly module once per thread (idempotent; concurrent callers share one load).
 * Never rejects: a failure is recorded and reported by {@link pffftLoadFailure}. In Node the
 * glue reads pffft.wasm from the package directory with fs (no network).
 */
export function loadPffft(): Promise<void> {
  if (loading === undefined) {
    loading = (async () => {
      let lastMessage = "";
      try {
        const imported = (await import("@echogarden/pffft-wasm/simd")) as { default: PffftFactory };
        // Keep the Emscripten glue off the console (the core library never prints).
        wasm = await imported.default({
          print: () => {},
          printErr: (text: string) => {
            lastMessage = text;
          },
        });
      } catch (error) {
        const text = error instanceof Error ? error.message : String(error);
        loadFailure = `${text}${lastMessage && !text.includes(lastMessage) ? ` (${lastMessage})` : ""}`.replace(/\s+/g, " ");
      }
    })();
  }
  return loading;
}

/** True once {@link loadPffft} has finished successfully on this thread. */
export function pffftLoaded(): boolean {
  return wasm !== undefined;
}

/** Why the load failed (one line), or undefined if it succeeded or has not been tried. */
export function pffftLoadFailure(): string | undefined {
  return loadFailure;
}

function loadedModule(): PffftModule {
  if (wasm !== undefined) return wasm;
  if (loadFailure !== undefined) {
    throw new InputError(`FFT backend "pffft" could not be loaded: ${loadFailure}`);
  }
  throw new InputError(`FFT backend "pffft" is not loaded on this thread; await loadFftBackends() first`);
}

function checkPffftSize(size: number, minimum: number, kind: string): void {
  if (size < minimum) {
    throw new InputError(`FFT size for the pffft backend (${kind}) must be a power of two ≥ ${minimum} (got ${size})`);
  }
}

function allocate(m: PffftModule, floats: number): number {
  const ptr = m._pffft_aligned_malloc(4 * floats);
  if (ptr === 0) throw new Error(`pffft: out of WebAssembly memory allocating ${floats} floats`);
  return ptr;
}

/** A PFFFT setup (read-only twiddles) and a work buffer, shared by everything of one size and kind. */
interface SizeState {
  setup: number;
  work: number;
  /** Input/output buffers of the copy API (allocated on first use; calls are synchronous). */
  copyIn: number;
  copyOut: number;
}

const states = new Map<string, SizeState>();

function sizeState(m: PffftModule, size: number, transform: number): SizeState {
  const key = `${transform}:${size}`;
  let state = states.get(key);
  if (state === undefined) {
    const setup = m._pffft_new_setup(size, transform);
    if (setup === 0) throw new InputError(`FFT size ${size} is not supported by the pffft backend`);
    const floats = transform === COMPLEX ? 2 * size : size;
    state = { setup, work: allocate(m, floats), copyIn: 0, copyOut: 0 };
    states.set(key, state);
  }
  return state;
}

function copyBuffers(m: PffftModule, state: SizeState, floats: number): void {
  if (state.copyIn === 0) {
    state.copyIn = allocate(m, floats);
    state.copyOut = allocate(m, floats);
  }
}

function checkLength(array: Float64Array, needed: number, what: string): void {
  if (array.length < needed) {
    throw new InputError(`FFT ${what} array must have length ≥ ${needed} (got ${array.length})`);
  }
}

/** Complex FFT (copy API): converts float64 in, transforms in float32, converts float64 out. */
export function createPffftComplex(size: number): ComplexFft {
  const m = loadedModule();
  checkPffftSize(size, MIN_COMPLEX, "complex");
  const state = sizeState(m, size, COMPLEX);
  copyBuffers(m, state, 2 * size);
  const { setup, work, copyIn, copyOut } = state;
  const n2 = 2 * size;
  function run(input: Float64Array, output: Float64Array, direction: number): void {
    checkLength(input, n2, "input");
    checkLength(output, n2, "output");
    const heap = m.HEAPF32; // re-read every call: an earlier view may have been detached
    heap.set(input.length === n2 ? input : input.subarray(0, n2), copyIn >> 2);
    m._pffft_transform_ordered(setup, copyIn, copyOut, work, direction);
    output.set(heap.subarray(copyOut >> 2, (copyOut >> 2) + n2));
  }
  return {
    size,
    backend: "pffft",
    precision: "single",
    forward(input, output) {
      run(input, output, FORWARD);
    },
    inverse(input, output) {
      run(input, output, BACKWARD);
    },
  };
}

/**
 * Real-input forward FFT (copy API). PFFFT's ordered real output packs N floats as
 * [X0.re, X(N/2).re, X1.re, X1.im, …, X(N/2−1).re, X(N/2−1).im] (pffft.h); this unpacks it
 * to bins 0..N/2 with zero imaginary parts at 0 and N/2.
 */
export function createPffftReal(size: number): RealFft {
  const m = loadedModule();
  checkPffftSize(size, MIN_REAL, "real");
  const state = sizeState(m, size, REAL);
  copyBuffers(m, state, size);
  const { setup, work, copyIn, copyOut } = state;
  return {
    size,
    backend: "pffft",
    precision: "single",
    forward(input, output) {
      checkLength(input, size, "input");
      checkLength(output, size + 2, "output");
      const heap = m.HEAPF32;
      const o = copyOut >> 2;
      heap.set(input.length === size ? input : input.subarray(0, size), copyIn >> 2);
      m._pffft_transform_ordered(setup, copyIn, copyOut, work, FORWARD);
      output[0] = heap[o];
      output[1] = 0;
      output.set(heap.subarray(o + 2, o + size), 2);
      output[size] = heap[o + 1];
      output[size + 1] = 0;
    },
  };
}

/** A Float32Array view of `floats` floats at `ptr`, rebuilt whenever the heap has grown. */
function liveView(m: PffftModule, ptr: number, floats: number): () => Float32Array {
  let view = new Float32Array(m.HEAPF32.buffer, ptr, floats);
  return () => {
    if (view.buffer !== m.HEAPF32.buffer) view = new Float32Array(m.HEAPF32.buffer, ptr, floats);
    return view;
  };
}

function disposedError(): InputError {
  return new InputError("FFT plan was used after dispose(); create a new plan");
}

/** Buffer-owning complex plan: `input`/`output` are views onto WebAssembly memory (no copies). */
export function createPffftComplexPlan(size: number): ComplexPlan {
  const m = loadedModule();
  checkPffftSize(size, MIN_COMPLEX, "complex");
  const { setup, work } = sizeState(m, size, COMPLEX);
  const inPtr = allocate(m, 2 * size);
  const outPtr = allocate(m, 2 * size);
  // Views are made after the last allocation above, then kept live by the getters.
  const inView = liveView(m, inPtr, 2 * size);
  const outView = liveView(m, outPtr, 2 * size);
  let disposed = false;
  return {
    size,
    backend: "pffft",
    precision: "single",
    get input() {
      return disposed ? new Float32Array(0) : inView();
    },
    get output() {
      return disposed ? new Float32Array(0) : outView();
    },
    forward() {
      if (disposed) throw disposedError();
      m._pffft_transform_ordered(setup, inPtr, outPtr, work, FORWARD);
    },
    inverse() {
      if (disposed) throw disposedError();
      m._pffft_transform_ordered(setup, inPtr, outPtr, work, BACKWARD);
    },
    dispose() {
      if (disposed) return;
      disposed = true;
      m._pffft_aligned_free(inPtr);
      m._pffft_aligned_free(outPtr);
    },
  };
}

/**
 * Buffer-owning real-input forward plan. PFFFT writes its packed N floats straight into the
 * N + 2 float output buffer, where bins 1..N/2−1 already sit in their ordered places; only the
 * two purely real bins are moved (X(N/2) from slot 1 to slot N), so there is no copy.
 */
export function createPffftRealPlan(size: number): RealPlan {
  const m = loadedModule();
  checkPffftSize(size, MIN_REAL, "real");
  const { setup, work } = sizeState(m, size, REAL);
  const inPtr = allocate(m, size);
  const outPtr = allocate(m, size + 2);
  const inView = liveView(m, inPtr, size);
  const outView = liveView(m, outPtr, size + 2);
  const o = outPtr >> 2;
  let disposed = false;
  return {
    size,
    backend: "pffft",
    precision: "single",
    get input() {
      return disposed ? new Float32Array(0) : inView();
    },
    get output() {
      return disposed ? new Float32Array(0) : outView();
    },
    forward() {
      if (disposed) throw disposedError();
      m._pffft_transform_ordered(setup, inPtr, outPtr, work, FORWARD);
      const heap = m.HEAPF32;
      heap[o + size] = heap[o + 1];
      heap[o + size + 1] = 0;
      heap[o + 1] = 0;
    },
    dispose() {
      if (disposed) return;
      disposed = true;
      m._pffft_aligned_free(inPtr);
      m._pffft_aligned_free(outPtr);
    },
  };
}
