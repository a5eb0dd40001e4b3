import { analyseClusterPlan } from './analyseClusterPlan';
import { ClusterModelError, clusterModel } from './clusterModel';

/**
 * The clusters design's two-level model (whose errors validatePlan reports) and closed forms, as
 * validatePlan and analysePlan reach them through the engine registry (src/core/engineRegistry.ts),
 * registered by src/core/allEngines.ts.
 */
export const clusterEngine = { analyseClusterPlan, clusterModel, ClusterModelError };

export type ClusterEngine = typeof clusterEngine;
