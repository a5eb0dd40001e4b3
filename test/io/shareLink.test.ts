import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { demoPlan, DEMO_PLAN } from '../../src/io/demoPlan';
import { decodePlanFromLink, encodePlanForLink } from '../../src/io/shareLink';
import { validPlanArb } from './planArbitrary';

function message(link: string): string {
  const r = decodePlanFromLink(link);
  if (r.ok) throw new Error('expected the link to be rejected');
  expect(r.problems).toHaveLength(1);
  return r.problems[0]!.message;
}

describe('share links', () => {
  it('any valid plan survives encode → decode unchanged (exact equality; non-ASCII labels included)', () => {
    fc.assert(
      fc.property(validPlanArb, (plan) => {
        expect(decodePlanFromLink(encodePlanForLink(plan))).toEqual({ ok: true, plan });
      }),
      { numRuns: 300 },
    );
  });
  it('is a #plan= fragment of URL-safe characters only (RFC 4648 §5 base64url, no padding)', () => {
    const p = demoPlan();
    p.groups.programme.label = 'Ärztinnen – 東京 🏥';
    const hash = encodePlanForLink(p);
    expect(hash).toMatch(/^#plan=[A-Za-z0-9_-]+$/);
    const back = decodePlanFromLink(`http://localhost:4173/some/path/${hash}`);
    expect(back.ok && back.plan.groups.programme.label).toBe('Ärztinnen – 東京 🏥');
  });
  it('reads a whole address, the fragment, or "plan=…", also among other fragment parameters', () => {
    const hash = encodePlanForLink(DEMO_PLAN);
    const want = { ok: true, plan: DEMO_PLAN };
    expect(decodePlanFromLink(hash)).toEqual(want);
    expect(decodePlanFromLink(hash.slice(1))).toEqual(want);
    expect(decodePlanFromLink(`https://example.org/meanward/?x=1#view=report&${hash.slice(1)}`)).toEqual(want);
  });
  it('a link cut short', () => {
    const hash = encodePlanForLink(DEMO_PLAN);
    for (const cut of [10, 101, hash.length - 7]) {
      expect(message(hash.slice(0, cut))).toBe(
        'This link is incomplete: it seems to have been cut short when it was copied. Copy the whole link again.',
      );
    }
  });
  it('a garbled link', () => {
    const hash = encodePlanForLink(DEMO_PLAN);
    expect(message(`${hash.slice(0, 40)} ${hash.slice(41)}`)).toBe(
      'This link is garbled: its plan part contains " " (character 35), which a plan link never has. Copy the whole link again.',
    );
  });
  it('a link without a plan', () => {
    expect(message('https://example.org/meanward/')).toBe('This link holds no plan: its address has no "#plan=" part.');
    expect(message('#plan=')).toBe('This link holds no plan: the part after "#plan=" is empty. Copy the whole link again.');
  });
  it('a readable link whose plan breaks a rule is checked like a plan file', () => {
    const p = demoPlan();
    p.pretest.reliability = 1.4;
    const r = decodePlanFromLink(encodePlanForLink(p));
    expect(r).toEqual({
      ok: false,
      problems: [{ field: 'pretest.reliability', message: 'Pretest reliability must be a number between 0 and 1 (exclusive); got 1.4.' }],
    });
  });
});
