// The engine registry (src/core/engineRegistry.ts): the covariate, cluster and selection-rule
// engines are found through it, a missing one is an error naming it (never another design's
// formulas), and everything outside the page registers all of them eagerly.
import { readFileSync } from 'node:fs';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { analysePlan } from '../../src/core/analysePlan';
import { registerAllEngines } from '../../src/core/allEngines';
import {
  ENGINE_NAMES,
  engine,
  enginesForPlan,
  isEngineRegistered,
  MissingEngineError,
  missingEngines,
  unregisterEngineForTests,
} from '../../src/core/engineRegistry';
import { analyseClusterPlan } from '../../src/core/clusters/analyseClusterPlan';
import { analyseSelectionPlan } from '../../src/core/design/analyseSelectionPlan';
import { covariateModelProblems } from '../../src/core/multivariate/covariateModelProblems';
import { validatePlan } from '../../src/core/validatePlan';
import { demoPlan } from '../../src/io/demoPlan';
import { AFTER_SCHOOL_MATHS, CLINIC_HIGH_READINGS, SCHOOLS_MATCHED_ON_MEANS, SCREENED_READING_SUPPORT } from '../../src/io/examplePlans';

afterEach(() => registerAllEngines());

describe('the engine registry', () => {
  it('holds every engine once src/core/allEngines.ts is imported (the test setup does, as the CLI and workers do)', () => {
    for (const name of ENGINE_NAMES) expect(isEngineRegistered(name), name).toBe(true);
    // The registered functions are the engines' own (not copies or stand-ins).
    expect(engine('clusters').analyseClusterPlan).toBe(analyseClusterPlan);
    expect(engine('selection').analyseSelectionPlan).toBe(analyseSelectionPlan);
    expect(engine('covariates').covariateModelProblems).toBe(covariateModelProblems);
  });

  it('names the engine each design needs: none for one pretest, one for covariates, clusters or a rule', () => {
    expect(enginesForPlan(demoPlan())).toEqual([]);
    expect(enginesForPlan(AFTER_SCHOOL_MATHS)).toEqual(['covariates']);
    expect(enginesForPlan(SCHOOLS_MATCHED_ON_MEANS)).toEqual(['clusters']);
    expect(enginesForPlan(SCREENED_READING_SUPPORT)).toEqual(['selection']);
    expect(enginesForPlan(CLINIC_HIGH_READINGS)).toEqual(['selection']);
    expect(missingEngines(AFTER_SCHOOL_MATHS)).toEqual([]);
    unregisterEngineForTests('covariates');
    expect(missingEngines(AFTER_SCHOOL_MATHS)).toEqual(['covariates']);
    expect(missingEngines(demoPlan())).toEqual([]);
  });

  it('a missing engine is a loud error naming it, from analysePlan and validatePlan alike', () => {
    for (const [name, plan] of [
      ['covariates', AFTER_SCHOOL_MATHS],
      ['clusters', SCHOOLS_MATCHED_ON_MEANS],
      ['selection', SCREENED_READING_SUPPORT],
    ] as const) {
      unregisterEngineForTests(name);
      expect(() => engine(name)).toThrow(MissingEngineError);
      expect(() => analysePlan(plan), name).toThrow(new RegExp(`"${name}" engine`));
      registerAllEngines();
    }
    // validatePlan never answers with a message for a plan it could not check: it throws too
    // (its catch-all "could not be checked" message would be a false one).
    unregisterEngineForTests('covariates');
    expect(() => validatePlan(AFTER_SCHOOL_MATHS)).toThrow(MissingEngineError);
    unregisterEngineForTests('clusters');
    expect(() => validatePlan(SCHOOLS_MATCHED_ON_MEANS)).toThrow(MissingEngineError);
    // …while a one-pretest plan needs neither and is analysed as before.
    expect(validatePlan(demoPlan()).ok).toBe(true);
    // Demo: beta(1 − rho)Delta = 0.8 · 0.25 · (−10) = −2 points (Thorndike 1942; closed form, computed).
    expect(analysePlan(demoPlan()).analyses.matchedDifference!.bias).toBeCloseTo(-2, 12);
  });

  it('gives the same figures through the registry as the engines called directly', () => {
    expect(analysePlan(SCHOOLS_MATCHED_ON_MEANS)).toEqual({
      ...analyseClusterPlan(SCHOOLS_MATCHED_ON_MEANS),
      requiredNCounts: analysePlan(SCHOOLS_MATCHED_ON_MEANS).requiredNCounts,
    });
    // Kish (1965) design effect 1 + (m − 1)·ICC = 1 + 24 · 0.2 = 5.8 for 25 pupils per school, ICC .2.
    expect(analysePlan(SCHOOLS_MATCHED_ON_MEANS).clusters!.designEffect.pretest).toBeCloseTo(5.8, 12);
  });
});

describe('eager registration outside the page', () => {
  it('the command line and the core\'s public entry register every engine on import (a fresh module graph)', async () => {
    vi.resetModules();
    const fresh = await import('../../src/core/engineRegistry');
    // A new instance of the registry, with nothing registered yet.
    expect(ENGINE_NAMES.filter((n) => fresh.isEngineRegistered(n))).toEqual([]);
    await import('../../src/cli/main');
    expect(ENGINE_NAMES.filter((n) => fresh.isEngineRegistered(n))).toEqual([...ENGINE_NAMES]);
    vi.resetModules();
    const fresh2 = await import('../../src/core/engineRegistry');
    expect(ENGINE_NAMES.filter((n) => fresh2.isEngineRegistered(n))).toEqual([]);
    await import('../../src/core/index');
    expect(ENGINE_NAMES.filter((n) => fresh2.isEngineRegistered(n))).toEqual([...ENGINE_NAMES]);
    vi.resetModules();
  });

  it('every worker, thread and the PDF builder imports src/core/allEngines.ts first thing', () => {
    // Workers cannot be started in this test process; their entry files are checked instead.
    for (const file of ['src/sim/worker.ts', 'src/sim/quickFiguresWorker.ts', 'src/pilot/pilotWorker.ts', 'src/sim/pool/simulationThread.ts', 'src/report/buildReportPdf.ts']) {
      expect(readFileSync(file, 'utf8'), file).toMatch(/^import '(\.\.\/)+core\/allEngines';$/m);
    }
  });
});
