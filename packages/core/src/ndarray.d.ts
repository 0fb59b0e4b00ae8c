// Ambient types for the untyped `ndarray` package (CommonJS), narrowed to what the core uses: a
// strided view of a typed array with its shape, strides, element access and storage index.
declare module "ndarray" {
  interface NdArray<D extends Float64Array = Float64Array> {
    readonly data: D;
    readonly shape: number[];
    readonly stride: number[];
    readonly offset: number;
    readonly size: number;
    get(...index: number[]): number;
    set(...indexAndValue: number[]): number;
    index(...index: number[]): number;
  }
  function ndarray<D extends Float64Array>(data: D, shape?: number[], stride?: number[], offset?: number): NdArray<D>;
  export type { NdArray };
  export default ndarray;
}
