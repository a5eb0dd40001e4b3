/**
 * The pilot-data module: read a pilot or earlier-wave file, estimate the
 * plan's inputs from it, and write them into a plan with their provenance.
 * Pure TypeScript (no DOM, React or Worker); see docs/pilot-data.md.
 */
export * from './types';
export { parseDelimitedText } from './parseDelimitedText';
export { estimatePilot, PILOT_CONFIDENCE_LEVEL, RELIABILITY_FLOOR, SMALL_GROUP_SIZE } from './estimatePilot';
export { applyPilotOffer, pilotPlanUpdate, pilotReliabilityOptions, type PilotPlanUpdateOptions } from './pilotPlanUpdate';
export { correlationDifference } from './correlationDifference';
export { widenLongTable } from './widenLongTable';
export { pessimisticPlan, pessimisticPlanResult, type PessimisticPlanResult } from './pessimisticPlan';
export { cronbachAlpha } from './cronbachAlpha';
export { feldtInterval } from './feldtInterval';
export { fisherZInterval } from './fisherZInterval';
export { fQuantile } from './fQuantile';
export { MISSING_CODES, parsePilotNumber } from './parsePilotNumber';
export { formatCoefficient, formatScore } from './formatPilotNumber';
