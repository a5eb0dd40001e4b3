/**
 * Layer tables of the ziggurat method (Marsaglia & Tsang 2000, "The ziggurat
 * method for generating random variables", Journal of Statistical Software
 * 5(8)) for a decreasing density f on [0, ∞) cut into `layers` pieces of equal
 * area v, the bottom one being the rectangle under f(r) plus the tail beyond r.
 *
 * x[0] = v / f(r) (the bottom layer's notional width), x[1] = r,
 * x[i + 1] = f⁻¹(v / x[i] + f(x[i])), x[layers] = 0. A draw picks layer i and
 * u uniform; u·x[i] is accepted at once when |u| < x[i + 1] / x[i] (the
 * `ratio` table); otherwise it is in a wedge (accept when a uniform height
 * between f(x[i]) and f(x[i + 1]) falls under f) or, in layer 0, in the tail.
 */
export interface ZigguratTables {
  readonly layers: number;
  /** Right edge of the tail region. */
  readonly r: number;
  /** x[0..layers]: layer widths, decreasing to x[layers] = 0. */
  readonly x: Float64Array;
  /** f(x[i]), i = 0..layers. */
  readonly fx: Float64Array;
  /** x[i + 1] / x[i], i = 0..layers-1: the share of layer i accepted without evaluating f. */
  readonly ratio: Float64Array;
}

/**
 * Build the tables for density f with inverse fInverse, tail start r and layer area v.
 * @param layers number of layers (a power of two, so a layer index is a bit mask).
 * @param r tail start, > 0; v layer area, > 0 (the published pair for `layers`).
 * @example zigguratTables(128, 3.442619855899, 9.91256303526217e-3, normal, normalInverse).x[127] // ≈ 0.2723 (top layer)
 */
export function zigguratTables(
  layers: number,
  r: number,
  v: number,
  f: (x: number) => number,
  fInverse: (y: number) => number,
): ZigguratTables {
  const x = new Float64Array(layers + 1);
  x[0] = v / f(r);
  x[1] = r;
  for (let i = 2; i < layers; i++) x[i] = fInverse(v / (x[i - 1] as number) + f(x[i - 1] as number));
  x[layers] = 0;
  const fx = new Float64Array(layers + 1);
  for (let i = 0; i <= layers; i++) fx[i] = f(x[i] as number);
  const ratio = new Float64Array(layers);
  for (let i = 0; i < layers; i++) ratio[i] = (x[i + 1] as number) / (x[i] as number);
  return { layers, r, x, fx, ratio };
}

/**
 * Tables for the standard normal (unnormalised density exp(-x²/2)), 128
 * layers: r = 3.442619855899, v = 9.91256303526217e-3 (Marsaglia & Tsang 2000,
 * section on the normal; from memory, checked here by the top layer's area
 * x[127]·(1 - f(x[127])) = v to 1e-9 in the tests).
 */
export const NORMAL_ZIGGURAT = zigguratTables(
  128,
  3.442619855899,
  9.91256303526217e-3,
  (x) => Math.exp(-0.5 * x * x),
  (y) => Math.sqrt(-2 * Math.log(y)),
);

/**
 * Tables for the standard exponential (density exp(-x)), 256 layers:
 * r = 7.69711747013104972, v = 3.949659822581572e-3 (Marsaglia & Tsang 2000,
 * section on the exponential; from memory, checked like the normal's).
 */
export const EXPONENTIAL_ZIGGURAT = zigguratTables(
  256,
  7.69711747013104972,
  3.949659822581572e-3,
  (x) => Math.exp(-x),
  (y) => -Math.log(y),
);
