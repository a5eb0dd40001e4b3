import type { AnalysisId } from './plan';
import type { SensitivityPoint } from './sensitivityCurve';

/**
 * Where one analysis' bias curve (default the matched difference) crosses an
 * edge of the tolerated band, by linear interpolation between neighbouring
 * curve points (the several-covariate and selection artefacts need not be
 * linear or monotone in x).
 * Reference: common practice (linear interpolation).
 * @param points the curve. @param band the tolerated band (none when its upper edge is not positive).
 * @param id the analysis whose curve is read.
 * @returns the x values, in curve order (may be empty).
 * @throws never.
 * @example bias −1, then +1 at x = 0 and 1, band ±0.5 → [0.25, 0.75]
 */
export function bandCrossings(points: SensitivityPoint[], band: { lower: number; upper: number }, id: AnalysisId = 'matchedDifference'): number[] {
  const out: number[] = [];
  if (!(band.upper > 0)) return out;
  for (let i = 1; i < points.length; i++) {
    const a = points[i - 1] as SensitivityPoint;
    const b = points[i] as SensitivityPoint;
    for (const edge of [band.lower, band.upper]) {
      const fa = (a.bias[id] ?? 0) - edge;
      const fb = (b.bias[id] ?? 0) - edge;
      if (fa === 0) out.push(a.x);
      else if (fa * fb < 0) out.push(a.x + ((b.x - a.x) * fa) / (fa - fb));
    }
  }
  const last = points[points.length - 1];
  if (last && (last.bias[id] === band.lower || last.bias[id] === band.upper)) out.push(last.x);
  return out;
}
