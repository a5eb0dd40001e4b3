import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { analysePlan } from '../../src/core/analysePlan';
import { capProblemList, moreProblemsLine } from '../../src/core/capProblemList';
import type { Plan } from '../../src/core/plan';
import { plainErrorMessage } from '../../src/core/plainErrorMessage';
import { validatePlan } from '../../src/core/validatePlan';
import { showControlCharacters } from '../../src/core/visibleText';
import { main } from '../../src/cli/main';
import { demoPlan } from '../../src/io/demoPlan';
import { AFTER_SCHOOL_MATHS } from '../../src/io/examplePlans';
import { serializePlan } from '../../src/io/planFile';
import { decodePlanFromLink, encodePlanForLink } from '../../src/io/shareLink';
import { estimatePilot } from '../../src/pilot/estimatePilot';
import { parseDelimitedText } from '../../src/pilot/parseDelimitedText';
import { pilotPlanUpdate } from '../../src/pilot/pilotPlanUpdate';
import { PilotDataError, type PilotEstimates } from '../../src/pilot/types';
import { evaluateDraftSafely } from '../../src/state/draftSlice';
import { AUTOSAVE_KEY } from '../../src/state/persistenceSlice';
import { planToDraft } from '../../src/state/planDraft';
import { makeStore, memoryStorage } from '../state/helpers';

// Messages are compared exactly or by their key phrases (tolerance: none): they
// are the product here. Plans are the invented examples with one value changed.

type Mutable = Record<string, any>;
const maths = (): Mutable => structuredClone(AFTER_SCHOOL_MATHS) as Mutable;
const demo = (): Mutable => structuredClone(demoPlan()) as Mutable;

/** Text a researcher should never see: library wording, NaN, a stack frame, an internal-fault label. */
const PROGRAM_TEXT = /Matrix|NaN|undefined|Infinity(?!\.)|Internal fault|\bat \S+ \(|TypeError|\n\s+at /;

function problems(input: unknown): Array<{ field: string; message: string }> {
  const r = validatePlan(input);
  if (r.ok) throw new Error('expected the plan to be refused');
  return r.problems;
}

async function cli(argv: string[]) {
  let stdout = '';
  let stderr = '';
  const code = await main(argv, { stdout: { write: (s: string) => (stdout += s) }, stderr: { write: (s: string) => (stderr += s) } });
  return { code, stdout, stderr };
}

let dir = '';
const file = (name: string, text: string): string => {
  const path = join(dir, name);
  writeFileSync(path, text);
  return path;
};
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'meanward-hardening-'));
});

describe('1. huge values: every numeric field has a documented range, refused with the usual message', () => {
  it('a covariate SD of 1e308 is refused by its range (it used to throw "Matrix is not symmetric")', () => {
    const p = maths();
    p.covariates[0].sd = 1e308;
    expect(problems(p)).toEqual([{ field: 'covariates.0.sd', message: 'Covariate 1 SD must be a number from 0.000001 to 1000000; got 1e+308.' }]);
  });
  it('posttest SD 1e124, pretest SD 1e200, an effect of 1e300 points and a mean of -1e200 are each refused by name', () => {
    const cases: Array<[(p: Mutable) => void, string, string]> = [
      [(p) => (p.outcome.posttestSD = 1e124), 'outcome.posttestSD', 'Posttest SD must be a number from 0.000001 to 1000000; got 1e+124.'],
      [(p) => (p.groups.comparison.pretestSD = 1e200), 'groups.comparison.pretestSD', 'Comparison group pretest SD must be a number from 0.000001 to 1000000; got 1e+200.'],
      [(p) => (p.outcome.hypothesisedEffect = 1e300), 'outcome.hypothesisedEffect', 'Hypothesised effect must be a number from -1000000 to 1000000; got 1e+300.'],
      [(p) => (p.groups.programme.pretestMean = -1e200), 'groups.programme.pretestMean', 'Programme group pretest mean must be a number from -1000000 to 1000000; got -1e+200.'],
      [(p) => (p.analysis.alpha = 5e-324), 'analysis.alpha', 'Significance level (alpha) must be a number at least 0.000001 and less than 0.5; got 5e-324.'],
      [(p) => (p.matching.caliper = 5e-324), 'matching.caliper', 'Caliper must be a number from 0.0001 to 5; got 5e-324.'],
      [(p) => (p.analysis.assumedReliability = 1e-300), 'analysis.assumedReliability', 'Assumed reliability for the corrected ANCOVA must be a number from 0.01 to 1; got 1e-300.'],
    ];
    for (const [mutate, field, message] of cases) {
      const p = demo();
      mutate(p);
      expect(problems(p)).toContainEqual({ field, message });
    }
  });
  it('the ends of every range are valid and analyse to finite figures (a mean of ±1e6, SDs of 1e-6 and 1e6)', () => {
    const p = demo() as Plan;
    p.groups.programme.pretestMean = 1_000_000;
    p.groups.comparison.pretestMean = -1_000_000;
    p.outcome.posttestSD = 0.000001;
    p.outcome.hypothesisedEffect = 1_000_000;
    p.outcome.growthGap = -1_000_000;
    const check = validatePlan(p);
    expect(check.ok).toBe(true);
    if (check.ok) expect(() => analysePlan(check.plan)).not.toThrow(); // analysePlan asserts every figure finite
  });
  it('pools of 250 and 2,000 with a large covariate gap analyse (the gain score no longer fails with "got 2 and 2")', () => {
    for (const mutate of [(p: Mutable) => (p.covariates[1].programmeMean = 432.5), (p: Mutable) => (p.outcome.hypothesisedEffect = 100_000)]) {
      const p = maths();
      mutate(p);
      const check = validatePlan(p);
      expect(check.ok).toBe(true);
      if (check.ok) expect(analysePlan(check.plan).analyses.gainScore!.requiredNPerGroup).not.toBeUndefined();
    }
  });
  it('validatePlan never throws: a value that fails while being read becomes one plain problem', () => {
    const p = demo();
    Object.defineProperty(p, 'title', { enumerable: true, get: () => { throw new TypeError('x is undefined'); } });
    const r = validatePlan(p);
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.problems).toHaveLength(1);
      expect(r.problems[0]!.message).toMatch(/^This plan could not be checked/);
      expect(r.problems[0]!.message).not.toMatch(PROGRAM_TEXT);
    }
  });
  it('a share link holding the huge covariate SD opens to a plain message, not a blank page', () => {
    const p = maths();
    p.covariates[0].sd = 1e308;
    const r = decodePlanFromLink(encodePlanForLink(p as Plan));
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.problems[0]!.message).toBe('Covariate 1 SD must be a number from 0.000001 to 1000000; got 1e+308.');
  });
  it('an autosave holding it restores the draft as typed with the problem shown, and the store still works', () => {
    const p = maths();
    p.covariates[0].sd = 1e308;
    const storage = memoryStorage();
    storage.setItem(AUTOSAVE_KEY, JSON.stringify({ version: 1, draft: planToDraft(p as Plan) }));
    const s = makeStore({ storage }).getState();
    expect(s.problems.map((q) => q.message).join(' ')).toContain('Covariate 1 SD must be a number from 0.000001 to 1000000');
    expect(s.analytic).not.toBeNull(); // the demo's results underneath, marked stale
  });
  it('typing 1e308 as a covariate SD in the form shows the range beside the field and keeps the text', () => {
    const store = makeStore();
    store.getState().loadExample('after-school-maths');
    expect(() => store.getState().setField('covariates.0.sd', '1e308')).not.toThrow();
    const s = store.getState();
    expect(s.problems).toContainEqual({ field: 'covariates.0.sd', message: 'Covariate 1 SD must be a number from 0.000001 to 1000000; got 1e+308.' });
    expect(JSON.stringify(s.draft)).toContain('1e308'); // the text as typed is kept
  });
  it('the store turns an unexpected failure into one plain problem (evaluateDraftSafely)', () => {
    const draft = planToDraft(demoPlan());
    const throwing = { validatePlan, analysePlan: () => { throw new Error('Matrix is not symmetric'); } };
    const r = evaluateDraftSafely(draft, throwing);
    expect('problems' in r && r.problems[0]!.message).toMatch(/^The figures for this plan could not be computed/);
    const broken = { validatePlan: () => { throw new RangeError('Invalid array length'); }, analysePlan };
    const r2 = evaluateDraftSafely(draft, broken);
    expect('problems' in r2 && r2.problems[0]!.message).not.toMatch(PROGRAM_TEXT);
  });
  it('the CLI refuses the huge covariate SD with exit 2 and one plain line, no stack trace', async () => {
    const p = maths();
    p.covariates[0].sd = 1e308;
    const f = file('huge-sd.json', JSON.stringify(p));
    const r = await cli(['run', f, '--no-sim', '--json']);
    expect(r.code).toBe(2);
    expect(r.stderr).toBe(`meanward: ${f}: covariates.0.sd: Covariate 1 SD must be a number from 0.000001 to 1000000; got 1e+308.\n`);
  });
  it('an unexpected failure inside the CLI prints one plain line and exits 1', async () => {
    const f = file('demo.json', serializePlan(demoPlan()));
    let stderr = '';
    const code = await main(['run', f, '--no-sim'], {
      stdout: { write: () => { throw new TypeError("Cannot read properties of undefined (reading 'x')"); } },
      stderr: { write: (s: string) => (stderr += s) },
    });
    expect(code).toBe(1);
    expect(stderr).toBe('meanward: Meanward stopped because of a fault of its own, not because of anything in your input. Please report it with the command and the file you used.\n');
  });
  it('plainErrorMessage keeps our sentences and replaces program text (common practice)', () => {
    expect(plainErrorMessage(new Error('Give the pretest an SEM.'), 'fallback')).toBe('Give the pretest an SEM.');
    expect(plainErrorMessage(new Error('Matrix is not symmetric'), 'fallback')).toBe('fallback');
    expect(plainErrorMessage(new Error('The bias must be a finite number; got NaN.'), 'fallback')).toBe('fallback');
    expect(plainErrorMessage('oops', 'fallback')).toBe('fallback');
  });
});

describe('2. pilot files at the edges of double precision', () => {
  const csv = (rows: string[][]) => rows.map((r) => r.join(',')).join('\n');
  const cohort = (score: (i: number) => string): string => {
    const rows = [['group', 'q1', 'q2', 'q3']];
    for (let i = 0; i < 24; i++) rows.push([i % 2 ? 'club' : 'rest', score(i), score(i + 7), score(i + 3)]);
    return csv(rows);
  };
  const mapping = { group: 'group', programmeValue: 'club', pretest: { kind: 'items' as const, columns: ['q1', 'q2', 'q3'], combine: 'sum' as const } };
  const estimate = (text: string) => estimatePilot(parseDelimitedText(text, { delimiter: 'auto', header: 'auto' }), mapping, 'invented.csv');

  it('scores around 1e-300 are refused as too small a spread, with what to do (it used to be exit 1 "Internal fault")', async () => {
    const text = cohort((i) => `${(1 + ((i * 7) % 5)) * 1e-300}`);
    expect(() => estimate(text)).toThrow(PilotDataError);
    expect(() => estimate(text)).toThrow(/varies by too little to compute with .* Rescale the scores/);
    const r = await cli(['pilot', file('tiny.csv', text), '--group', 'group', '--programme', 'club', '--items', 'q1,q2,q3']);
    expect(r.code).toBe(2);
    expect(r.stderr).not.toMatch(PROGRAM_TEXT);
  });
  it('scores just above 1e15 are refused with the limit named, not as "must hold numbers"', () => {
    const text = cohort((i) => String(1_000_000_000_000_001 + i));
    expect(() => estimate(text)).toThrow(
      'Column "q1" must hold scores of at most 1,000,000,000,000,000 (10^15) in size (larger ones cannot be added up exactly), but row 2 holds "1000000000000001"',
    );
  });
  it('"Use these values" does not write an SD of 1e-160: it is skipped with the range in the reason', () => {
    const est: PilotEstimates = estimate(cohort((i) => String(1 + ((i * 7) % 5))));
    const tiny = structuredClone(est);
    tiny.groups.programme.pretestSD = 1e-160;
    const { plan, skipped } = pilotPlanUpdate(demoPlan(), tiny);
    expect(validatePlan(plan).ok).toBe(true);
    expect(plan.groups.programme.pretestSD).toBe(demoPlan().groups.programme.pretestSD);
    expect(skipped.find((s) => s.path === 'groups.programme.pretestSD')?.reason).toContain(
      'Programme group pretest SD must be a number from 0.000001 to 1000000; got 1e-160.',
    );
  });
  it('a column listed twice among the items names both roles', () => {
    const text = cohort((i) => String(1 + ((i * 7) % 5)));
    expect(() => estimatePilot(parseDelimitedText(text, { delimiter: 'auto', header: 'auto' }), { ...mapping, pretest: { ...mapping.pretest, columns: ['q1', 'q2', 'q1'] } })).toThrow(
      'The column "q1" is mapped both as item 1 of 3 and as item 3 of 3; each column can have one role only.',
    );
  });
});

describe('3. long problem lists are cut after 50', () => {
  it('capProblemList keeps 50 and says how many more (common practice)', () => {
    const lines = Array.from({ length: 120 }, (_, i) => `problem ${i + 1}`);
    const out = capProblemList(lines);
    expect(out).toHaveLength(51);
    expect(out[49]).toBe('problem 50');
    expect(out[50]).toBe('…and 70 more problems of the same kind; fix those above and check again.');
    expect(capProblemList(['a', 'b'])).toEqual(['a', 'b']);
    expect(moreProblemsLine(1)).toBe('…and 1 more problem of the same kind; fix those above and check again.');
  });
  it('50,000 bad provenance entries give 51 lines on stderr, not 100,000', async () => {
    const p = demo();
    p.provenance = Object.fromEntries(Array.from({ length: 50_000 }, (_, i) => [`field${i}`, { source: 'guess', note: 7 }]));
    const r = await cli(['run', file('provenance.json', JSON.stringify(p)), '--no-sim']);
    expect(r.code).toBe(2);
    const lines = r.stderr.trimEnd().split('\n');
    expect(lines).toHaveLength(51);
    expect(lines[50]).toBe('meanward: …and 99,950 more problems of the same kind; fix those above and check again.');
  });
});

describe('4. control characters in user text are shown escaped', () => {
  it('showControlCharacters escapes C0, DEL, C1 and direction overrides, and nothing else (common practice)', () => {
    expect(showControlCharacters('A\u001b[2J\u0007\rB\u0000')).toBe('A\\x1b[2J\\x07\\x0dB\\x00');
    expect(showControlCharacters('x\u007f\u009b\u202ey')).toBe('x\\x7f\\x9b\\u202ey');
    expect(showControlCharacters('Ünïcode – “quotes” ✓')).toBe('Ünïcode – “quotes” ✓');
    expect(showControlCharacters('{\n  "a": "\\u001b\u009b"\n}', 'json')).toBe('{\n  "a": "\\u001b\\u009b"\n}');
  });
  it('the CLI table shows ESC, BEL and CR from the title, labels and covariate names escaped', async () => {
    const p = maths();
    p.title = 'Invented\u001b[2J title\u0007\r';
    p.groups.programme.label = 'Club\u001b]0;pwned\u0007';
    p.covariates[0].name = 'Attendance\u001b[31m';
    const r = await cli(['run', file('escapes.json', JSON.stringify(p)), '--no-sim']);
    expect(r.code).toBe(0);
    expect(r.stdout).not.toMatch(/[\u0000-\u0009\u000b-\u001f\u007f-\u009f]/);
    expect(r.stdout).toContain('Invented\\x1b[2J title\\x07\\x0d');
    expect(r.stdout).toContain('Club\\x1b]0;pwned\\x07');
    expect(r.stdout).toContain('Attendance\\x1b[31m');
    const json = await cli(['run', file('escapes.json', JSON.stringify(p)), '--no-sim', '--json']);
    expect(JSON.parse(json.stdout).plan.title).toBe(p.title); // JSON keeps the text, escaped as JSON
  });
  it('messages quoting a covariate name or a pilot column show NUL and ESC escaped', async () => {
    const p = maths();
    p.covariates[0].name = 'Same\u0000\u001b';
    p.covariates[1].name = 'Same\u0000\u001b';
    const ps = problems(p);
    expect(ps.map((q) => q.message).join(' ')).toContain('are both called "Same\\u0000\\u001b".');
    const r = await cli(['run', file('names.json', JSON.stringify(p)), '--no-sim']);
    expect(r.stderr).not.toMatch(/[\u0000-\u0009\u000b-\u001f]/);
    const text = 'group,q\u001b1,q2\nclub,1,2\n';
    const pilot = await cli(['pilot', file('esc.csv', text), '--group', 'group', '--programme', 'club', '--pretest', 'q\u001b9']);
    expect(pilot.code).toBe(2);
    expect(pilot.stderr).toContain('q\\x1b9');
    expect(pilot.stderr).not.toMatch(/[\u0000-\u0009\u000b-\u001f]/);
  });
});
