import { showControlCharacters } from '../core/visibleText';
/**
 * Types of the pilot-data module: reading a pilot (or earlier-wave) file,
 * estimating the plan's inputs from it, and writing them into a plan.
 *
 * Everything here is plain data (strings, numbers, arrays, objects) so it
 * passes through `postMessage` (structured clone) unchanged; the one class,
 * `PilotDataError`, should be sent as `{ name, message, code, column, row }`.
 * Field names are part of the interface the browser and the command line use:
 * later versions may add fields, never rename these.
 */
import type { Plan } from '../core/plan';

/** A field delimiter the reader understands. */
export type Delimiter = ',' | '\t' | ';';

/** How to read the text; each option is detected when left out or 'auto'. */
export interface ParseOptions {
  delimiter?: Delimiter | 'auto';
  header?: boolean | 'auto';
}

/** A rectangular table of cells as text (no conversion to numbers yet). */
export interface ParsedTable {
  /** Column names: the header row, or "column 1", "column 2", … when there is none. */
  columns: string[];
  /** Data rows; every row has `columns.length` cells (short rows padded with ""). */
  rows: string[][];
  delimiter: Delimiter;
  hasHeader: boolean;
  /**
   * Line number (1-based, as a spreadsheet shows it) of each data row in the
   * file, for messages that name a row. Optional for callers that build tables
   * by hand; then row i is line i + 1 (+1 more with a header).
   */
  lineNumbers?: number[];
  /** Lines starting with '#' that were skipped (e.g. a label "# Invented data …"). */
  commentLines?: number;
}

/** Where the pretest comes from: one total-score column, or item columns combined. */
export type PretestSource =
  | { kind: 'total'; column: string }
  | { kind: 'items'; columns: string[]; combine: 'sum' | 'mean'; reverse?: ReverseItems };

/**
 * Reverse-keyed items: each score x in these columns is read as
 * maximum + minimum − x before anything is estimated. Scores outside
 * [minimum, maximum] are refused (they cannot be on the stated scale).
 */
export interface ReverseItems {
  /** Item columns to reverse (each must be one of the pretest's item columns). */
  columns: string[];
  /** Lowest possible score of an item, e.g. 1 on a 1–6 scale. */
  minimum: number;
  /** Highest possible score of an item, e.g. 6 on a 1–6 scale. */
  maximum: number;
}

/**
 * A long file: one row per person per occasion. The rows of one person share
 * the `id` value; the `occasion` column says which measurement a row holds.
 * The pretest columns (total or items) are read from the row at
 * `pretestOccasion`; the retest and posttest are the same score (total, or
 * the items combined) at `retestOccasion` and `posttestOccasion`.
 */
export interface LongLayout {
  kind: 'long';
  id: string;
  occasion: string;
  pretestOccasion: string;
  retestOccasion?: string;
  posttestOccasion?: string;
}

/** Which columns mean what. Column names as in `ParsedTable.columns`. */
export interface PilotMapping {
  /** Column holding the group label of each row. */
  group: string;
  /** The value of `group` that marks the programme group; every other non-empty value is the comparison group. */
  programmeValue: string;
  pretest: PretestSource;
  /** Optional column with the same test taken again (test–retest reliability). */
  retest?: string;
  /** Optional column with the posttest / outcome. */
  posttest?: string;
  /** A long file (one row per person per occasion); absent = one row per person. */
  layout?: LongLayout;
}

/** An estimate with a two-sided confidence interval at `level` (e.g. 0.95). */
export interface Interval {
  value: number;
  lower: number;
  upper: number;
  level: number;
}

/** One group's descriptive estimates. */
export interface GroupEstimates {
  /** Rows used (after the missing-data rule). */
  n: number;
  pretestMean: number;
  /** Sample SD (n − 1 denominator). */
  pretestSD: number;
  /** Sample SD of the posttest over rows with pretest and posttest present. */
  posttestSD?: number;
  /** Pearson correlation of pretest and posttest within this group. */
  prePostCorrelation?: number;
  /** Rows with pretest and posttest both present. */
  nPrePost?: number;
}

/** A plain-words warning; `code` is stable for the UI, `message` is shown. */
export interface PilotWarning {
  code: string;
  message: string;
}

export interface PilotEstimates {
  fileName?: string;
  /** The mapping the estimates were made with. */
  mapping?: PilotMapping;
  rowsRead: number;
  rowsUsed: number;
  rowsDropped: number;
  /** Plain words: which rows were dropped and why, and which rule each statistic uses. */
  droppedReason: string;
  groups: { programme: GroupEstimates; comparison: GroupEstimates; comparisonValue: string };
  /** Programme minus comparison: in points, and as an SMD on the pooled within-group SD. */
  gap: { points: number; smd: number };
  pooledWithinSD: number;
  reliability: {
    /** Pooled within-group alpha (item scores centred on their group's item means), Feldt (1965) CI. */
    alpha?: Interval & { n: number; items: number };
    alphaByGroup?: { programme: Interval & { n: number }; comparison: Interval & { n: number } };
    /** Odd–even split (items 1, 3, 5, … vs 2, 4, 6, …), pooled within group, stepped up by Spearman–Brown. */
    splitHalf?: { halfCorrelation: number; spearmanBrown: number; n: number };
    /** Pooled within-group pretest–retest correlation with a Fisher z CI. */
    testRetest?: { value: number; n: number; lower: number; upper: number; level: number };
  };
  /** Pooled within-group pretest–posttest correlation. */
  prePostCorrelation?: { value: number; n: number };
  /**
   * The two groups' pre–post correlations side by side, when both are
   * estimated: the difference, Fisher's z test of it (two independent
   * correlations), whether they differ (two-sided p < .05 or a gap of .10 or
   * more), which one the plan uses (the comparison group's) and why, in words.
   */
  prePostByGroup?: PrePostByGroup;
  /** For a long file: rows in the file and people (ids) they were gathered into. */
  longFile?: { rows: number; people: number };
  /** Corrected item–total correlation per item (pooled within group). */
  itemTotal?: { column: string; correctedCorrelation: number }[];
  warnings: PilotWarning[];
}

/** The two groups' pre–post correlations compared (see PilotEstimates.prePostByGroup). */
export interface PrePostByGroup {
  programme: { value: number; n: number };
  comparison: { value: number; n: number };
  /** Programme minus comparison. */
  difference: number;
  /** Fisher's z statistic for the difference of two independent correlations, and its two-sided p. */
  z: number;
  p: number;
  differ: boolean;
  /** The plan's outcome.prePostCorrelation is the comparison group's. */
  used: 'comparison';
  message: string;
}

/** One plan field written from the pilot estimates. */
export interface AppliedPilotField {
  /** Dotted plan path, e.g. "pretest.reliability" (the key used in `Plan.provenance`). */
  path: string;
  value: number;
  /** The provenance note written for it. */
  note: string;
}

/** One plan field NOT written, because the value would break a plan rule. */
export interface SkippedPilotField {
  /** Dotted plan path, e.g. "outcome.prePostCorrelation". */
  path: string;
  /** The pilot value that was not written. */
  value: number;
  /** Plain words naming the rule and the values, e.g. "0.93 is above √(reliability 0.81) = 0.90 …". */
  reason: string;
}

/** Which pilot reliability goes into the plan's pretest reliability. */
export type PilotReliabilitySource = 'alpha' | 'test-retest';

/** One reliability the researcher can choose to write into the plan, with why (or why not). */
export interface PilotReliabilityOption {
  source: PilotReliabilitySource;
  value: number;
  /** e.g. "Cronbach's alpha within groups, .81 (95% CI .77 to .85)". */
  label: string;
  /** Plain words: what this coefficient counts as error, and so when it fits. */
  why: string;
  /** The one suggested: test–retest when a retest was mapped (day-to-day error is what regresses), else alpha. */
  recommended: boolean;
}

/**
 * A further change the researcher is asked about, not made silently: e.g.
 * the corrected ANCOVA's assumed reliability, when the pretest reliability
 * changes. `applyPilotOffer` makes it.
 */
export interface PilotOffer {
  /** Dotted plan path, e.g. "analysis.assumedReliability". */
  path: string;
  current: number;
  proposed: number;
  /** The question in plain words, with both values and why. */
  message: string;
  /** Provenance note written when accepted. */
  note: string;
}

/** What `pilotPlanUpdate` returns: the new plan (always valid) and what was and was not written. */
export interface PilotPlanUpdate {
  plan: Plan;
  applied: AppliedPilotField[];
  skipped: SkippedPilotField[];
  /** Changes to ask about (never made by pilotPlanUpdate itself). */
  offers: PilotOffer[];
  /** Which reliability was written into pretest.reliability, when one was. */
  reliabilitySource?: PilotReliabilitySource;
}

/** Kind of bad input, stable for the UI. */
export type PilotDataErrorCode =
  | 'empty-file'
  | 'binary-file'
  | 'single-column'
  | 'duplicate-header'
  | 'ragged-row'
  | 'bad-quotes'
  | 'missing-column'
  | 'non-numeric'
  | 'one-group'
  | 'programme-value-absent'
  | 'too-few-items'
  | 'constant-item'
  | 'constant-column'
  | 'tiny-spread'
  | 'too-few-rows'
  | 'bad-mapping'
  | 'out-of-scale'
  | 'long-layout';

/** Bad pilot file or mapping. The message names the column or row, the rule and the value. */
export class PilotDataError extends Error {
  readonly code: PilotDataErrorCode;
  readonly column?: string;
  /** Row as the user sees it in a spreadsheet (the file's line number, 1-based). */
  readonly row?: number;

  constructor(code: PilotDataErrorCode, message: string, where: { column?: string; row?: number } = {}) {
    // Column names and cells are quoted from the file: control characters are shown escaped.
    super(showControlCharacters(message));
    this.name = 'PilotDataError';
    this.code = code;
    if (where.column !== undefined) this.column = where.column;
    if (where.row !== undefined) this.row = where.row;
  }
}
