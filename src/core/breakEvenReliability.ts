import type { BreakEven } from './analyticResults';
import type { ModelParameters } from './modelParameters';
import { parallelFormsNeeded } from './parallelFormsNeeded';
import { formatNumber, requireNonNegative } from './inputChecks';

/**
 * The comparison group's within-group pretest reliability at which the
 * matched-difference artefact shrinks to the tolerable share of the hoped-for
 * effect: |beta(1 − rho*)Delta| = share·|tau|, so rho* = 1 − share·|tau| / |beta·Delta|,
 * and the number of averaged parallel pretests (Spearman–Brown) that would
 * take the current reliability there. The growth gap is not part of this
 * artefact (no pretest reliability removes it).
 *
 * Reference: closed form of the matched-groups regression effect (Thorndike
 * 1942; Campbell & Erlebacher 1970; computed) and Spearman (1910) – Brown (1910).
 *
 * @param m model parameters (tau = m.effect, Delta = m.pretestGap, beta = m.beta, rho = m.reliability.comparison).
 * @param tolerableShare share of |tau| an artefact may reach (≥ 0), e.g. 0.25.
 * @returns a BreakEven record; reliability null (with a note) when tau = 0,
 *   Delta = 0 or beta = 0, or when any reliability would do.
 * @throws Error when tolerableShare is negative.
 * @example tau 2.5, share .25, beta .8, Delta −10 → rho* = 1 − 0.625/8 = 0.921875;
 *   from .75 that takes 4 parallel forms (exact 3.93)
 */
export function breakEvenReliability(m: ModelParameters, tolerableShare: number): BreakEven {
  requireNonNegative(tolerableShare, 'The tolerable share of the effect');
  const tau = m.effect;
  const rho = m.reliability.comparison;
  if (tau === 0) {
    return {
      reliability: null,
      alreadyMet: false,
      parallelForms: null,
      note: 'No effect is hoped for (0), so any artefact is large relative to it: see the false-positive rate instead.',
    };
  }
  const artefactPerUnit = Math.abs(m.beta * m.pretestGap);
  if (!(artefactPerUnit > 0)) {
    return {
      reliability: null,
      alreadyMet: true,
      parallelForms: null,
      note:
        m.pretestGap === 0
          ? 'The groups have the same pretest mean, so matching creates no regression artefact at any reliability.'
          : 'The outcome does not depend on the pretest (slope 0), so matching creates no regression artefact.',
    };
  }
  const target = 1 - (tolerableShare * Math.abs(tau)) / artefactPerUnit;
  if (!(target > 0)) {
    return {
      reliability: null,
      alreadyMet: true,
      parallelForms: 1,
      note: 'The artefact stays within the tolerable share of the effect at any pretest reliability.',
    };
  }
  return breakEvenFromTarget(
    rho,
    target,
    rho >= target,
    'The hoped-for effect is so small beside the pretest gap that only a perfectly reliable pretest would keep the ' +
      'artefact tolerable: no number of parallel pretests reaches it.',
  );
}

/**
 * The break-even record once the break-even reliability is known, shared by
 * breakEvenReliability and covariateBreakEven: already reached; reachable
 * only by a perfectly reliable pretest (target ≥ 1 − 1e-12); or the number of
 * averaged parallel pretests that take the current reliability there.
 *
 * Reference: Spearman (1910) – Brown (1910), through parallelFormsNeeded.
 *
 * @param rho the comparison group's current within-group reliability, in (0, 1).
 * @param target the break-even reliability, in (0, 1].
 * @param alreadyMet whether the current reliability already keeps the artefact tolerable.
 * @param onlyPerfectNote the note when only a perfectly reliable pretest would do.
 * @returns a BreakEven record.
 * @throws Error from parallelFormsNeeded when rho or target is out of range.
 * @example breakEvenFromTarget(0.75, 0.921875, false, '…') → parallelForms 4 (exact 3.93)
 */
export function breakEvenFromTarget(rho: number, target: number, alreadyMet: boolean, onlyPerfectNote: string): BreakEven {
  if (alreadyMet) {
    return {
      reliability: target,
      alreadyMet: true,
      parallelForms: 1,
      note: `The comparison group's within-group reliability (${formatNumber(rho)}) already reaches the break-even ${formatNumber(target)}.`,
    };
  }
  if (!(target < 1 - 1e-12)) {
    return { reliability: 1, alreadyMet: false, parallelForms: null, note: onlyPerfectNote };
  }
  const { forms } = parallelFormsNeeded(rho, target);
  return {
    reliability: target,
    alreadyMet: false,
    parallelForms: forms,
    note:
      `The comparison group's within-group reliability must rise from ${formatNumber(rho)} to ${formatNumber(target)}: ` +
      `the average of ${forms} parallel pretests would do it (Spearman–Brown).`,
  };
}
