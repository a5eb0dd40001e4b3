/**
 * The planner's display formatters. They live in the neutral module
 * src/format/numbers.ts (below ui, report and cli); this file re-exports them
 * so the components keep one short import.
 */
export { fmt, fmtDuration, fmtInt, fmtPct, fmtR, fmtSigned } from '../format/numbers';
