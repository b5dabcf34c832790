import { describe, expect, it } from 'vitest';
import { csvField, toCsv } from '../../server/reports/csv';
import { CAUTION_TEXT, money, roundFigures, statementParagraphs, statementText, type StatementFigures } from '../../figures';

const figures: StatementFigures = {
  memberLabel: 'Mid career',
  age: 42,
  retirementAge: 67,
  currency: 'GBP',
  optionName: 'Balanced lifecycle',
  pots: { weak: 118_499.99, typical: 181_947.23, strong: 297_500 },
  incomes: { weak: 5_049.99, typical: 7_750, strong: 12_649.5 },
  annuityYears: 25,
  paths: 20_000,
  whatIf: { extraContribution: 24_612.4, laterRetirement: 19_480, paths: 2000 },
  draft: false,
};

/** Syllables by vowel groups, less a silent final e; at least one per word. Common practice, no source. */
function syllables(word: string): number {
  const w = word.toLowerCase().replace(/[^a-z]/g, '');
  if (!w) return 0;
  const groups = w.replace(/e$/, '').match(/[aeiouy]+/g);
  return Math.max(1, groups ? groups.length : 1);
}

/**
 * Flesch reading ease = 206.835 − 1.015 × (words / sentences) − 84.6 × (syllables / words)
 * (R. Flesch, "A new readability yardstick", Journal of Applied Psychology 32(3), 1948 — from memory).
 * 60 and above is usually read as plain English (common practice, no source).
 */
function readingEase(text: string): number {
  const sentences = text.split(/[.!?]+(?:\s|$)/).filter((s) => s.trim()).length;
  const words = text.split(/\s+/).filter((w) => /[A-Za-z]/.test(w));
  const syl = words.reduce((n, w) => n + syllables(w), 0);
  return 206.835 - 1.015 * (words.length / sentences) - 84.6 * (syl / words.length);
}

describe('statement wording', () => {
  it('rounds pots and incomes by the figures layer’s rules, as stated in the notes', () => {
    const r = roundFigures(figures);
    expect(r.pots).toEqual({ weak: 118_000, typical: 182_000, strong: 298_000 });
    expect(r.incomes).toEqual({ weak: 5_000, typical: 7_800, strong: 12_600 });
    const t = statementText(figures);
    expect(t.cases.map((c) => c.pot)).toEqual(['£118,000', '£182,000', '£298,000']);
    expect(t.notes[0]).toBe('Pots are rounded to the nearest £100 below £10,000 and to the nearest £1,000 from £10,000.');
    expect(t.notes[1]).toBe('Yearly incomes are rounded to the nearest £10 below £1,000 and to the nearest £100 from £1,000.');
    // A small pot keeps its hundreds.
    expect(statementText({ ...figures, pots: { ...figures.pots, weak: 8_449.99 } }).cases[0].pot).toBe('£8,400');
    expect(t.changes[0]).toBe('Paying in 2% more of your pay each year could add about £25,000 to your pot in a typical case.');
    expect(t.changes[1]).toBe('Retiring 2 years later, at 69, could add about £19,000 to your pot in a typical case.');
  });

  it('keeps sentences short and the whole statement easy to read', () => {
    const paras = statementParagraphs(statementText(figures)).filter((p) => p !== CAUTION_TEXT);
    const sentences = paras.flatMap((p) => p.split(/(?<=[.!?])\s+/));
    for (const s of sentences) expect(s.split(/\s+/).length, s).toBeLessThanOrEqual(25);
    const ease = readingEase(paras.join(' '));
    expect(ease, `reading ease ${ease.toFixed(1)}`).toBeGreaterThanOrEqual(60);
    // Trade words stay out of what members read, except where the notes name the percentiles.
    const memberText = paras.filter((p) => !p.includes('percentiles')).join(' ').toLowerCase();
    for (const jargon of ['stochastic', 'monte carlo', 'volatility', 'glide path', 'certainty equivalent', 'annuity', 'real terms', 'lambda']) expect(memberText).not.toContain(jargon);
  });

  it('says when assumptions are draft, and says nothing of it otherwise', () => {
    expect(statementText({ ...figures, draft: true }).caution.join(' ')).toContain('draft assumptions');
    expect(statementText(figures).caution.join(' ')).not.toContain('draft');
  });

  it('states a change that lowers the pot as a fall, not a negative addition', () => {
    const t = statementText({ ...figures, whatIf: { ...figures.whatIf, laterRetirement: -3_200 } });
    expect(t.changes[1]).toContain(`could take about ${money(3_200, 'GBP')} off your pot`);
  });

});

describe('CSV (RFC 4180)', () => {
  it.each([
    ['plain', 'plain'],
    ['a,b', '"a,b"'],
    ['say "hi"', '"say ""hi"""'],
    ['two\nlines', '"two\nlines"'],
    ['=SUM(A1)', "'=SUM(A1)"],
    [181947.23, '181947.23'],
    [null, ''],
  ])('writes %j as %s', (v, out) => {
    expect(csvField(v as string)).toBe(out);
  });

  it('ends every record with CRLF', () => {
    expect(toCsv(['a', 'b'], [[1, 'x,y']])).toBe('a,b\r\n1,"x,y"\r\n');
  });
});
