import type { ArtefactVerdict } from './analyticResults';
import { requireFinite, requireNonNegative } from './inputChecks';

/**
 * How an expected artefact changes the conclusion about a hoped-for effect:
 * - 'negligible': |bias| ≤ tolerableShare·|tau| (or, when tau = 0, |bias| ≤ noEffectFloor);
 * - 'invents': tau = 0 but a non-zero difference is expected;
 * - 'inflates': the bias has the effect's sign (the programme looks better than it is);
 * - 'reverses': the expected estimate tau + bias has the opposite sign to tau;
 * - 'hides': the bias opposes the effect and shrinks the estimate toward (or to) zero.
 *
 * Reference: common practice (the hiding, reversing and inventing of effects by
 * regression artefacts: Campbell & Erlebacher 1970).
 *
 * @param tau hoped-for effect, points (finite). @param bias expected artefact, points (finite).
 * @param tolerableShare share of |tau| an artefact may reach (≥ 0).
 * @param noEffectFloor |bias| treated as zero when tau = 0, points (default 1e-9: numerical zero).
 * @returns the verdict.
 * @throws Error on non-finite input or a negative share.
 * @example classifyArtefact(2.5, -4, 0.25) // 'reverses'
 */
export function classifyArtefact(tau: number, bias: number, tolerableShare: number, noEffectFloor = 1e-9): ArtefactVerdict {
  requireFinite(tau, 'The hoped-for effect');
  requireFinite(bias, 'The bias');
  requireNonNegative(tolerableShare, 'The tolerable share of the effect');
  if (tau === 0) return Math.abs(bias) <= noEffectFloor ? 'negligible' : 'invents';
  if (Math.abs(bias) <= tolerableShare * Math.abs(tau)) return 'negligible';
  if (Math.sign(bias) === Math.sign(tau)) return 'inflates';
  const estimate = tau + bias;
  return Math.sign(estimate) === -Math.sign(tau) ? 'reverses' : 'hides';
}
