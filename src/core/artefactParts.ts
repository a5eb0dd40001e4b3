import { formatPointsText } from './inputChecks';

/**
 * The plain sentence that says an assumed growth gap offsets the regression
 * artefact (they have opposite signs), or null when it does not (no gap, no
 * artefact, or both the same way). Two guessed biases that happen to cancel
 * do not make a design safe, so the verdict is judged on the regression
 * artefact alone; this sentence says so.
 *
 * Reference: common practice (the bias of a non-randomised comparison as a
 * sum of separate sources: Campbell & Erlebacher 1970; Shadish, Cook &
 * Campbell 2002, ch. 5).
 * @param regressionArtefact points. @param growthGap points. @param net their sum, points.
 * @returns the sentence, or null.
 * @throws never.
 * @example growthGapNote(-2, 1.5, -0.5) // "The growth gap you assumed (1.50 points) offsets most of the regression artefact (−2.00 points) ..."
 */
export function growthGapNote(regressionArtefact: number, growthGap: number, net: number): string | null {
  if (growthGap === 0 || regressionArtefact === 0 || Math.sign(growthGap) === Math.sign(regressionArtefact)) return null;
  const howMuch = Math.abs(growthGap) >= Math.abs(regressionArtefact) ? 'all' : Math.abs(growthGap) >= Math.abs(regressionArtefact) / 2 ? 'most' : 'part';
  return (
    `The growth gap you assumed (${formatPointsText(growthGap)} points) offsets ${howMuch} of the regression artefact ` +
    `(${formatPointsText(regressionArtefact)} points), leaving a net shift of ${formatPointsText(net)} points. ` +
    'Both are guesses; two guessed biases that happen to cancel do not make a safe design, so the verdict is judged on the regression artefact alone.'
  );
}
