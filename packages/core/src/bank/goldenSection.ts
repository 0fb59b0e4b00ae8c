// Golden-section search for the maximum of a unimodal function on an interval.

/**
 * The maximum of f on [lo, hi] by golden-section search (Kiefer, Proc. Am. Math. Soc. 4, 502
 * (1953), from memory; common practice): `iterations` steps, each shrinking the bracket by 0.618 with one new
 * evaluation. Returns the better of the two final interior points and its value. For a minimum,
 * maximise −f.
 */
export function goldenSectionMax(f: (x: number) => number, lo: number, hi: number, iterations: number): { x: number; value: number } {
  const g = (Math.sqrt(5) - 1) / 2;
  let a = lo;
  let b = hi;
  let x1 = b - g * (b - a);
  let x2 = a + g * (b - a);
  let f1 = f(x1);
  let f2 = f(x2);
  for (let it = 0; it < iterations; it++) {
    if (f1 < f2) {
      a = x1;
      x1 = x2;
      f1 = f2;
      x2 = a + g * (b - a);
      f2 = f(x2);
    } else {
      b = x2;
      x2 = x1;
      f2 = f1;
      x1 = b - g * (b - a);
      f1 = f(x1);
    }
  }
  return f1 > f2 ? { x: x1, value: f1 } : { x: x2, value: f2 };
}
