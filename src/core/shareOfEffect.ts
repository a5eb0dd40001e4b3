/**
 * An artefact as a share of the hoped-for effect: bias / tau. null when tau is
 * 0 or so small that the ratio is not a finite number (no meaningful share).
 *
 * Reference: common practice (relative bias).
 *
 * @param bias expected artefact, posttest points (finite).
 * @param tau hoped-for effect, posttest points (finite).
 * @returns bias / tau, or null.
 * @throws never.
 * @example shareOfEffect(-2, 2.5) // -0.8
 */
export function shareOfEffect(bias: number, tau: number): number | null {
  if (tau === 0) return null;
  const r = bias / tau;
  return Number.isFinite(r) ? r : null;
}
