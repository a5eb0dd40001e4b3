import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { runCli } from './runCli';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import mammoth from 'mammoth';
import { beforeAll, describe, expect, it } from 'vitest';
import { methodsText } from '../../src/core/methodsText';
import { PLANNING_CAUTION } from '../../src/core/planningCaution';
import { demoPlan } from '../../src/io/demoPlan';
import { SCHOOLS_MATCHED_ON_MEANS } from '../../src/io/examplePlans';
import { serializePlan } from '../../src/io/planFile';
import { methodsMarkdown, methodsParagraphText } from '../../src/report/methodsTextRender';
import { analysePlannedProcedure } from '../../src/sim/analysePlannedProcedure';

const run = runCli;

let dir = '';
let demoFile = '';
let schoolsFile = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'meanward-methods-'));
  demoFile = join(dir, 'demo.json');
  schoolsFile = join(dir, 'schools.json');
  writeFileSync(demoFile, serializePlan(demoPlan()));
  writeFileSync(schoolsFile, serializePlan(SCHOOLS_MATCHED_ON_MEANS));
});

describe('meanward methods (Markdown)', () => {
  it('prints the same Markdown as the core text over the figures "run --no-sim" uses', async () => {
    const r = await run(['methods', demoFile]);
    expect(r.code).toBe(0);
    expect(r.stderr).toBe('');
    const plan = demoPlan();
    expect(r.stdout).toBe(methodsMarkdown(methodsText(plan, analysePlannedProcedure(plan))));
    // The demo's ANCOVA artefact, beta(1 − rho)Delta = .8·.25·(−10) = −2.00 (Lord 1960 closed form; computed).
    // (The matched difference here is the quick simulation's figure for the planned procedure.)
    expect(r.stdout).toContain('ANCOVA on the observed pretest −2.00 (−80% of the effect)');
    expect(r.stdout).toContain('## References');
    expect(r.stdout).toContain(PLANNING_CAUTION);
  });

  it('-o writes the Markdown to a file and says so on stderr', async () => {
    const out = join(dir, 'schools.md');
    const r = await run(['methods', schoolsFile, '-o', out]);
    expect(r.code).toBe(0);
    expect(r.stdout).toBe('');
    expect(r.stderr).toContain('wrote the methods text');
    const md = readFileSync(out, 'utf8');
    // Kish (1965) design effect 1 + 24·.25 = 7.00 (computed).
    expect(md).toContain('the design effect on the posttest is 7.00 (Kish, 1965)');
  });

  it('bad command lines get one specific message each', async () => {
    const r = await run(['methods', demoFile, '--format', 'pdf']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('--format must be "md" (Markdown) or "docx" (Word); got "pdf"');
    const d = await run(['methods', demoFile, '--format', 'docx']);
    expect(d.code).toBe(2);
    expect(d.stderr).toContain('add -o FILE');
    const none = await run(['methods']);
    expect(none.stderr).toContain('needs a plan file');
    const missing = await run(['methods', join(dir, 'nope.json')]);
    expect(missing.code).toBe(2);
    expect(missing.stderr).toContain('there is no such file');
  });
});

describe('meanward methods --format docx', () => {
  it('writes a Word document whose text, read back with mammoth, is the methods text', async () => {
    const out = join(dir, 'demo.docx');
    const r = await run(['methods', demoFile, '--format', 'docx', '-o', out]);
    expect(r.code).toBe(0);
    const bytes = readFileSync(out);
    // A .docx is a zip: it starts with "PK" (ECMA-376 Part 2, common practice).
    expect(bytes.subarray(0, 2).toString('latin1')).toBe('PK');
    const { value } = await mammoth.extractRawText({ buffer: bytes });
    const plan = demoPlan();
    const m = methodsText(plan, analysePlannedProcedure(plan));
    const flat = value.replace(/\s+/g, ' ');
    for (const p of m.paragraphs) expect(flat).toContain(`${p.heading}. ${methodsParagraphText(p)}`);
    expect(flat).toContain(PLANNING_CAUTION);
    for (const ref of m.references) expect(flat).toContain(ref.entry);
    // Lord (1960) closed form for the demo's ANCOVA, computed as above.
    expect(flat).toContain('ANCOVA on the observed pretest −2.00 (−80% of the effect)');
  });
});
