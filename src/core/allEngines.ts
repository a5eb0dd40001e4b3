import { registerEngine } from './engineRegistry';
import { covariateEngine } from './multivariate/covariateEngine';
import { clusterEngine } from './clusters/clusterEngine';
import { selectionEngine } from './design/selectionEngine';

/**
 * Registers every engine (covariates, clusters, selection rules) in the engine registry on import.
 * Everything outside the page imports this once — the CLI, the simulation, quick-figures and pilot
 * workers and threads, the PDF builder, tests (test/setup.ts) and scripts — so analysePlan works
 * for every design there exactly as before. The page loads it on demand (src/state/pageEngines.ts).
 */
registerAllEngines();

/** Re-register (a test that unregistered engines puts them back with this). */
export function registerAllEngines(): void {
  registerEngine('covariates', covariateEngine);
  registerEngine('clusters', clusterEngine);
  registerEngine('selection', selectionEngine);
}
