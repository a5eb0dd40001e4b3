import { analyseClusterPlan } from './analyseClusterPlan';

/**
 * The clusters design's closed forms as analysePlan reaches them through the engine registry
 * (src/core/engineRegistry.ts), registered by src/core/allEngines.ts. The cluster model's checks
 * (clusterModel) stay on the first screen because validation needs them.
 */
export const clusterEngine = { analyseClusterPlan };

export type ClusterEngine = typeof clusterEngine;
