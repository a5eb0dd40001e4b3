/**
 * Fixed wording of the PDF summary: verdict sentences, the model in brief,
 * references and cautions. Plain data so the planner's screens can show the
 * same words, and tests can check the PDF against them.
 */
import type { ArtefactVerdict } from '../core/analyticResults';
import { centralCutOffVarianceInflation } from '../core/design/centralCutOffVarianceInflation';
import { formatPoints } from './format';

/** One plain sentence per artefact verdict (used on screen and in the PDF). */
export const VERDICT_TEXT: Record<ArtefactVerdict, string> = {
  negligible: 'the expected artefact is within the tolerable share of the hoped-for effect',
  hides: 'the artefact works against the hoped-for effect and would shrink it toward zero',
  reverses:
    'the artefact outweighs the hoped-for effect and points the other way: a beneficial programme is expected to look harmful',
  inflates: 'the artefact has the same sign as the hoped-for effect: the programme would look better than it is',
  invents: 'no effect is hoped for, yet the analysis is expected to show a group difference',
};

/** Short verdict labels for tables. */
export const VERDICT_LABEL: Record<ArtefactVerdict, string> = {
  negligible: 'negligible',
  hides: 'hides the effect',
  reverses: 'reverses the effect',
  inflates: 'inflates the effect',
  invents: 'invents an effect',
};

/** The one-line caution printed under the title and in the download panel. */
export const CAUTION_LINE =
  'A planning aid under stated assumptions: not a substitute for a statistician’s review, an ethics board’s judgement or local regulations.';

/** The model in a few lines (classical test theory, normal linear outcome). */
export const MODEL_LINES: string[] = [
  'Pretest (classical test theory): in group g (P = programme, C = comparison) the true score is T ~ N(μ_g, σ²_Tg); the observed pretest is X = T + E with E ~ N(0, SEM²). The SEM belongs to the instrument and is the same in both groups, so the within-group reliability is ρ_g = σ²_Tg / (σ²_Tg + SEM²).',
  'Outcome (normal linear model): Y = a + d_g + β·T + τ·[g = P] + e, e ~ N(0, σ²_e). β is the slope of the outcome on the true pretest, d_P − d_C = δ is growth that is not the programme, τ is the programme effect. β and σ_e follow from the post-test SD and the within-group pre–post correlation.',
  'Why matching misleads: within a group the expected true score of a person observed at x is μ_g + ρ_g (x − μ_g) (Kelley). Matched people with equal x therefore still differ in true score by (1 − ρ)Δ, Δ = μ_P − μ_C: regression toward the mean.',
  'Expected estimates (infinite pools, exact matching, equal reliabilities): matched post-test difference and ANCOVA on the observed pretest, τ + δ + β(1 − ρ)Δ; gain score, τ + δ + (β − 1)Δ; reliability-corrected ANCOVA with assumed reliability ρ′, τ + δ + β(1 − ρ/ρ′)Δ.',
  'Power, false-positive and wrong-sign rates use the t distribution with the estimate’s approximate standard error, shifted by the expected bias.',
  'The simulation draws whole studies from the model (finite pools, the planned caliper, ratio, replacement and matching order, discarded programme members), runs each analysis, and summarises the estimates; each simulated figure carries its Monte Carlo standard error (MC SE).',
];

/** The model of a plan whose groups a rule forms (added after MODEL_LINES). */
export const SELECTION_MODEL_LINES: string[] = [
  'Groups formed by a rule: one population with true scores T ~ N(μ, σ²_T); the pretest X = T + E, a screener S = T + E_S with its own independent error, or the true score itself is the basis B the rule looks at. A cut-off rule selects everyone on one side of c; a probability rule selects with chance Φ((c − B)/s) (or the mirror image above c). The groups are the two sides of the rule, so their means, SDs and sizes follow from truncated-normal moments, not from inputs.',
  `Which analysis is biased follows from what the rule looked at: ANCOVA on the variable the rule used is unbiased (Kenny 1975); on anything else, regression toward the mean within each side of the cut-off biases matching, ANCOVA, gain scores and the corrected ANCOVA. Regression discontinuity (outcome on group and the rule’s score) is unbiased when the rule used a measured score and the outcome is linear in it; its estimate varies more than a randomised study’s of the same size (Goldberger 1972; about ${formatPoints(centralCutOffVarianceInflation())} times at a central cut-off).`,
  'A one-group study re-measures only the selected people: with no programme their mean moves back toward the population mean by the amount regression toward the mean predicts (Barnett, van der Pols & Dobson 2005), and a pre–post change cannot tell that movement from an effect.',
];

/** References added when a rule forms the groups. */
export const SELECTION_REFERENCES: string[] = [
  'Barnett, A. G., van der Pols, J. C., & Dobson, A. J. (2005). Regression to the mean: what it is and how to deal with it. International Journal of Epidemiology, 34.',
  'Cappelleri, J. C., Darlington, R. B., & Trochim, W. M. K. (1994). Power analysis of cutoff-based randomized clinical trials. Evaluation Review, 18.',
  'Goldberger, A. S. (1972). Selection bias in evaluating treatment effects (discussion paper, University of Wisconsin).',
];

/** References cited by the summary. Page numbers are omitted unless verified. */
export const REFERENCES: string[] = [
  'Brown, W. (1910). Some experimental results in the correlation of mental abilities. British Journal of Psychology, 3.',
  'Campbell, D. T., & Erlebacher, A. (1970). How regression artifacts in quasi-experimental evaluations can mistakenly make compensatory education look harmful. In J. Hellmuth (Ed.), Compensatory Education: A National Debate (Disadvantaged Child, Vol. 3).',
  'Cochran, W. G., & Rubin, D. B. (1973). Controlling bias in observational studies: a review. Sankhyā, Series A, 35.',
  'Cohen, J. (1988). Statistical Power Analysis for the Behavioral Sciences (2nd ed.).',
  'Kelley, T. L. (1947). Fundamentals of Statistics.',
  'Kenny, D. A. (1975). A quasi-experimental approach to assessing treatment effects in the nonequivalent control group design. Psychological Bulletin, 82.',
  'Lord, F. M. (1960). Large-sample covariance analysis when the control variable is fallible. Journal of the American Statistical Association, 55.',
  'Lord, F. M., & Novick, M. R. (1968). Statistical Theories of Mental Test Scores.',
  'Porter, A. C. (1967). The effects of using fallible variables in the analysis of covariance (doctoral dissertation, University of Wisconsin).',
  'Spearman, C. (1910). Correlation calculated from faulty data. British Journal of Psychology, 3.',
  'Stuart, E. A. (2010). Matching methods for causal inference: a review and a look forward. Statistical Science, 25.',
  'Thorndike, R. L. (1942). Regression fallacies in the matched groups experiment. Psychometrika, 7.',
];

/** Cautions: what the summary is, and what the model leaves out. */
export const CAUTIONS: string[] = [
  'This summary is a planning aid. Its figures hold only under the assumptions stated above; it is not a substitute for a statistician’s review, an ethics board’s judgement, or the regulations that apply where the study is run.',
  'The model leaves out: non-normal score distributions (floors, ceilings, skew); non-linear relations between the outcome and the pretest or covariates; reliabilities that differ across settings or groups beyond what the SEM implies; attrition between pretest and follow-up; clustering (classes, clinics, areas); and every covariate or confounder not listed in the plan (when none is listed, the pretest is the only one).',
  'Reliability figures from a test manual describe the manual’s norm sample. Within-group reliability in your groups can be lower; check it in pilot data where possible.',
  'A design that removes the artefact under this model can still be biased by selection on things the pretest does not capture.',
];
