/**
 * A starting value for an ICC, with its label and where it came from. The
 * researcher can change it; the source is shown beside it.
 */
export interface IccPreset {
  id: string;
  /** Plain label, e.g. "Reading, grade 3, no covariate". */
  label: string;
  /** Intraclass correlation of achievement between schools. */
  icc: number;
  /** Whether the ICC is of the raw scores or of the scores adjusted for a pretest. */
  conditioning: 'unconditional' | 'conditional-on-pretest';
  /** Author, year, table; "from memory" when the value is recalled, not looked up. */
  source: string;
}

const SOURCE =
  'Hedges & Hedberg (2007), Educational Evaluation and Policy Analysis 29, 60–87, national US samples of schools (values from memory, rounded: check the paper\u2019s tables before relying on them)';

/**
 * Typical ICCs of school achievement by grade band, without and with a
 * pretest covariate, as starting values for a plan's clusters.pretestICC and
 * clusters.posttestICC. Hedges & Hedberg (2007) report unconditional
 * school-level ICCs of mathematics and reading achievement of roughly
 * .20–.25 across grades, and much smaller ones (often about half or less)
 * once a pretest is controlled. The grade-band values below are FROM MEMORY
 * (rounded to the nearest .05 of the paper's pattern, not copied from its
 * tables); every preset says so in its source. Use them to start, then
 * replace them with values for your own population.
 * @example ICC_PRESETS[0].icc // 0.25
 */
export const ICC_PRESETS: readonly IccPreset[] = [
  { id: 'elementary-unconditional', label: 'Achievement, elementary grades (K–5), no covariate', icc: 0.25, conditioning: 'unconditional', source: SOURCE },
  { id: 'middle-unconditional', label: 'Achievement, middle grades (6–8), no covariate', icc: 0.2, conditioning: 'unconditional', source: SOURCE },
  { id: 'high-unconditional', label: 'Achievement, high school (9–12), no covariate', icc: 0.2, conditioning: 'unconditional', source: SOURCE },
  { id: 'elementary-pretest', label: 'Achievement, elementary grades, after a pretest', icc: 0.1, conditioning: 'conditional-on-pretest', source: SOURCE },
  { id: 'middle-pretest', label: 'Achievement, middle grades, after a pretest', icc: 0.05, conditioning: 'conditional-on-pretest', source: SOURCE },
  { id: 'high-pretest', label: 'Achievement, high school, after a pretest', icc: 0.05, conditioning: 'conditional-on-pretest', source: SOURCE },
];
