/**
 * Per-cluster sums for a person-level regression of Y on the group and one
 * covariate x, about a common centre (x − cx, y − cy): n, Σx, Σx², Σy, Σxy,
 * Σy², and the cluster's group (1 programme, 0 comparison). Allocated once.
 */
export class ClusterSums {
  readonly n: Float64Array;
  readonly sx: Float64Array;
  readonly sxx: Float64Array;
  readonly sy: Float64Array;
  readonly sxy: Float64Array;
  readonly syy: Float64Array;
  readonly group: Uint8Array;
  count = 0;
  constructor(capacity: number) {
    this.n = new Float64Array(capacity);
    this.sx = new Float64Array(capacity);
    this.sxx = new Float64Array(capacity);
    this.sy = new Float64Array(capacity);
    this.sxy = new Float64Array(capacity);
    this.syy = new Float64Array(capacity);
    this.group = new Uint8Array(capacity);
  }
}

const A = new Float64Array(9);

/**
 * The person-level ANCOVA (OLS of Y on an intercept, the programme indicator
 * and a covariate x) with its cluster-robust CR2 standard error (Bell &
 * McCaffrey 2002, Survey Methodology 28, 169–181):
 *   V = (X'X)⁻¹ [Σ_c X_c' A_c e_c e_c' A_c' X_c] (X'X)⁻¹,  A_c = (I − H_cc)^(−1/2),
 * H_cc = X_c (X'X)⁻¹ X_c' the cluster's block of the hat matrix, e the OLS
 * residuals; df = clusters − 2 (the simple small-sample rule for a contrast
 * of two groups of clusters; Bell & McCaffrey's Satterthwaite df is close to
 * it for an indicator that is constant within clusters). Beside it, the naive
 * OLS SE that ignores the clustering, df N − 3.
 *
 * Computed from per-cluster sums only: within a cluster the rows are
 * (1, g_c, x_i) = Z_c B_c with Z_c = (1, x_i) and B_c = [[1, g_c, 0], [0, 0, 1]],
 * so H_cc = Z_c M Z_c' with M = B_c (X'X)⁻¹ B_c'; with Z_c = Q R (R from the
 * Cholesky factor of Z_c'Z_c) its non-zero eigenvalues are those of R M R', and
 * X_c' A_c e_c = B_c'(f + R'V D V'R'⁻¹ f) with f = Z_c'e_c, V D V' = (I − R M R')^(−1/2) − I.
 * A covariate constant within a cluster (a cluster mean) makes Z_c of rank 1:
 * then X_c' A_c e_c = b Σe / sqrt(1 − n b'(X'X)⁻¹ b) with b the cluster's row.
 * Cost O(clusters) after the sums.
 *
 * @param s per-cluster sums (s.count clusters; x and y centred at a common point for accuracy).
 * @param out Float64Array(≥ 5) receiving [estimate, CR2 SE, df (clusters − 2), naive SE, N − 3].
 * @returns false (out untouched) when there are fewer than 2 clusters per group, X'X is singular,
 *   a cluster's leverage reaches 1, or an SE is not positive and finite.
 * @throws never.
 * @example see test/sim/clusterRobust.test.ts (checked against the full-matrix formula).
 */
export function clusterRobustAncova(s: ClusterSums, out: Float64Array): boolean {
  const J = s.count;
  let N = 0, Ng = 0, Sx = 0, Sxg = 0, Sxx = 0, Sy = 0, Syg = 0, Sxy = 0, Syy = 0;
  let JP = 0;
  for (let c = 0; c < J; c++) {
    const n = s.n[c] as number, g = s.group[c] as number;
    N += n; Sx += s.sx[c] as number; Sxx += s.sxx[c] as number; Sy += s.sy[c] as number; Sxy += s.sxy[c] as number; Syy += s.syy[c] as number;
    if (g === 1) { JP++; Ng += n; Sxg += s.sx[c] as number; Syg += s.sy[c] as number; }
  }
  if (JP < 2 || J - JP < 2 || !(N > 3)) return false;
  // X'X = [[N, Ng, Sx], [Ng, Ng, Sxg], [Sx, Sxg, Sxx]]: its inverse by cofactors.
  const a = N, b = Ng, c0 = Sx, d = Ng, e = Sxg, f = Sxx;
  const C00 = d * f - e * e, C01 = -(b * f - c0 * e), C02 = b * e - c0 * d;
  const det = a * C00 + b * C01 + c0 * C02;
  if (!(Math.abs(det) > 1e-12 * Math.abs(a * d * f)) || !Number.isFinite(det)) return false;
  A[0] = C00 / det; A[1] = C01 / det; A[2] = C02 / det;
  A[4] = (a * f - c0 * c0) / det; A[5] = -(a * e - b * c0) / det; A[8] = (a * d - b * b) / det;
  A[3] = A[1] as number; A[6] = A[2] as number; A[7] = A[5] as number;
  const r0 = Sy, r1 = Syg, r2 = Sxy;
  const b0 = (A[0] as number) * r0 + (A[1] as number) * r1 + (A[2] as number) * r2;
  const b1 = (A[3] as number) * r0 + (A[4] as number) * r1 + (A[5] as number) * r2;
  const b2 = (A[6] as number) * r0 + (A[7] as number) * r1 + (A[8] as number) * r2;
  const sse = Math.max(0, Syy - (b0 * r0 + b1 * r1 + b2 * r2));
  const a10 = A[3] as number, a11 = A[4] as number, a12 = A[5] as number;
  let V = 0;
  for (let k = 0; k < J; k++) {
    const n = s.n[k] as number, g = s.group[k] as number;
    const sx = s.sx[k] as number, sxx = s.sxx[k] as number;
    const f1 = (s.sy[k] as number) - n * b0 - n * g * b1 - b2 * sx;
    const f2 = (s.sxy[k] as number) - b0 * sx - b1 * g * sx - b2 * sxx;
    // M = B A B' (2 × 2).
    const m11 = (A[0] as number) + 2 * g * (A[1] as number) + g * g * (A[4] as number);
    const m12 = (A[2] as number) + g * (A[5] as number);
    const m22 = A[8] as number;
    const zdet = n * sxx - sx * sx;
    let u0: number, u1: number, u2: number;
    if (zdet > 1e-10 * n * Math.max(sxx, 1e-300)) {
      const r11 = Math.sqrt(n), r12 = sx / r11, r22 = Math.sqrt(zdet / n);
      // K = R M R', R = [[r11, r12], [0, r22]].
      const t11 = r11 * m11 + r12 * m12, t12 = r11 * m12 + r12 * m22, t22 = r22 * m22;
      const k11 = t11 * r11 + t12 * r12, k12 = t12 * r22, k22 = t22 * r22;
      // Eigen-decomposition of the symmetric 2 × 2 K.
      const half = (k11 - k22) / 2;
      const root = Math.sqrt(half * half + k12 * k12);
      const mid = (k11 + k22) / 2;
      const mu1 = mid + root, mu2 = mid - root;
      if (!(mu1 < 1)) return false;
      let v1x: number, v1y: number;
      if (root > 1e-14 * Math.max(Math.abs(mid), 1e-300) && Math.abs(k12) > 0) {
        v1x = mu1 - k22; v1y = k12;
        const len = Math.hypot(v1x, v1y);
        v1x /= len; v1y /= len;
      } else {
        v1x = 1; v1y = 0;
      }
      const v2x = -v1y, v2y = v1x;
      const d1 = 1 / Math.sqrt(1 - mu1) - 1, d2 = 1 / Math.sqrt(1 - mu2) - 1;
      const h1 = f1 / r11, h2 = (f2 - r12 * h1) / r22;
      const p1 = d1 * (v1x * h1 + v1y * h2), p2 = d2 * (v2x * h1 + v2y * h2);
      const q1 = p1 * v1x + p2 * v2x, q2 = p1 * v1y + p2 * v2y;
      const w1 = f1 + r11 * q1, w2 = f2 + r12 * q1 + r22 * q2;
      u0 = w1; u1 = g * w1; u2 = w2;
    } else {
      // x constant within the cluster: one non-zero eigenvalue n·b'Ab, b = (1, g, x̄).
      const xb = sx / n;
      const bAb = m11 + 2 * xb * m12 + xb * xb * m22;
      const lev = n * bAb;
      if (!(lev < 1)) return false;
      const scale = f1 / Math.sqrt(1 - lev);
      u0 = scale; u1 = g * scale; u2 = xb * scale;
    }
    const t = a10 * u0 + a11 * u1 + a12 * u2;
    V += t * t;
  }
  const se = Math.sqrt(V);
  const naive = Math.sqrt((sse / (N - 3)) * a11);
  if (!(se > 0) || !Number.isFinite(se) || !(naive > 0) || !Number.isFinite(naive) || !Number.isFinite(b1)) return false;
  out[0] = b1;
  out[1] = se;
  out[2] = J - 2;
  out[3] = naive;
  out[4] = N - 3;
  return true;
}
