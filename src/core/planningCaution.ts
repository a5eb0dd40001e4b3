/**
 * The caution to show wherever results are presented (screen, report, CLI):
 * the figures come from a model of the study, not from data. One wording, used
 * everywhere. Reference: common practice in design reports.
 * @example PLANNING_CAUTION.startsWith('These figures') // true
 */
export const PLANNING_CAUTION =
  'These figures come from a statistical model of the planned study, not from data: they rest on the assumptions ' +
  'listed (normal scores, linear outcome, the reliability and correlations entered). They inform research design; ' +
  'they are not a substitute for a statistician or an ethics board.';
