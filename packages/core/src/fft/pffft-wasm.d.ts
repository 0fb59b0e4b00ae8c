// Ambient type for the untyped Emscripten glue of @echogarden/pffft-wasm; pffft.ts casts the
// factory's result to the narrow interface it actually uses.
declare module "@echogarden/pffft-wasm/simd" {
  const createPffftModule: (options?: Record<string, unknown>) => Promise<unknown>;
  export default createPffftModule;
}
