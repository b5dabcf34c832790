import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { CAUTION_TEXT } from '../../server/reports/caution';
import { csvField, toCsv } from '../../server/reports/csv';
import { formatMoney, roundTo } from '../../server/reports/format';
import { roundFigures, STATEMENT_ROUNDING, statementParagraphs, statementText, type StatementFigures } from '../../server/reports/statementText';

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
  it.each([
    [181_947.23, 1000, 182_000],
    [181_499.99, 1000, 181_000],
    [181_500, 1000, 182_000],
    [7_749.99, 100, 7_700],
    [7_750, 100, 7_800],
    [-24_500, 1000, -25_000],
  ])('rounds %d to the nearest %d as %d', (v, step, expected) => {
    expect(roundTo(v, step)).toBe(expected);
  });

  it('rounds pots to the nearest £1,000 and incomes to the nearest £100, as stated in the notes', () => {
    expect(STATEMENT_ROUNDING).toEqual({ pot: 1000, income: 100 });
    const r = roundFigures(figures);
    expect(r.pots).toEqual({ weak: 118_000, typical: 182_000, strong: 298_000 });
    expect(r.incomes).toEqual({ weak: 5_000, typical: 7_800, strong: 12_600 });
    const t = statementText(figures);
    expect(t.cases.map((c) => c.pot)).toEqual(['£118,000', '£182,000', '£298,000']);
    expect(t.notes[0]).toBe('Pots are rounded to the nearest £1,000. Yearly incomes are rounded to the nearest £100.');
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
    expect(t.changes[1]).toContain(`could take about ${formatMoney(3_000)} off your pot`);
  });

  it('uses the same caution wording as the app', () => {
    const src = fs.readFileSync(path.resolve(__dirname, '../../components/CautionNotice.tsx'), 'utf8');
    const m = /CAUTION_TEXT =\s*([\s\S]*?);\n/.exec(src);
    expect(m, 'CAUTION_TEXT in components/CautionNotice.tsx').toBeTruthy();
    // Evaluate the string-literal concatenation as written there.
    const appText = (m![1].match(/'(?:[^'\\]|\\.)*'|"(?:[^"\\]|\\.)*"/g) ?? []).map((lit) => lit.slice(1, -1).replace(/\\'/g, "'")).join('');
    expect(appText).toBe(CAUTION_TEXT);
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
