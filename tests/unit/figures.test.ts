import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  baselineOf,
  baselineSentence,
  BREAK_EVEN_COLUMNS,
  breakEvenRows,
  compactMoney,
  count,
  differenceCells,
  date,
  dateTime,
  daysBetween,
  difference,
  differenceSentence,
  leadCell,
  leadSentence,
  NO_TARGET_TEXT,
  pairedDifference,
  rankAt,
  storedFigures,
  TOO_CLOSE_TEXT,
  tooCloseLines,
  tooCloseNote,
  type ExactFigures,
  differencesToBaseline,
  lambda,
  money,
  moneyAxis,
  moneyChange,
  moneyRoundingNote,
  parseNumberInput,
  parsePercentInput,
  percent,
  percentagePoints,
  percentInputText,
  percentileLabel,
  pinFirst,
  roundMoney,
  SEPARATION_Z,
  valueAxis,
  wholeTicks,
  type RankedOption,
} from '../../figures';
import { separation } from '../../simulation';
import type { StoredVariant } from '../../server/jobs/result';
import { numberCell } from '../../server/uploads';

describe('money, one rule per context', () => {
  it.each([
    [181_947.23, 'pot', '£182,000'],
    [181_499.99, 'pot', '£181,000'],
    [181_500, 'pot', '£182,000'],
    [9_949.99, 'pot', '£9,900'],
    [9_950, 'pot', '£10,000'],
    [10_000, 'pot', '£10,000'],
    [10_499, 'pot', '£10,000'],
    [-24_500, 'pot', '−£25,000'],
    [-40, 'pot', '£0'],
    [7_749.99, 'income', '£7,700'],
    [7_750, 'income', '£7,800'],
    [845.5, 'income', '£850'],
    [1_234.5, 'standardError', '£1,200'],
    [45.4, 'standardError', '£45'],
    [0, 'standardError', '£0'],
    [32_450.4, 'entered', '£32,450'],
  ] as const)('%d as a %s reads %s', (v, context, text) => {
    expect(money(v, 'GBP', context)).toBe(text);
  });

  it('states each rule in words with the scheme’s currency', () => {
    expect(moneyRoundingNote('pot', 'GBP')).toBe('Pots are rounded to the nearest £100 below £10,000 and to the nearest £1,000 from £10,000.');
    expect(moneyRoundingNote('pot', 'EUR')).toContain('€1,000');
  });

  it('says nothing for a figure that is not a number, and signs differences', () => {
    expect(money(Number.NaN, 'GBP')).toBe('—');
    expect(money(null, 'GBP')).toBe('—');
    expect(moneyChange(13_100, 'GBP')).toBe('+£13,000');
    expect(moneyChange(3_140, 'GBP')).toBe('+£3,100');
    expect(moneyChange(-1_240, 'GBP')).toBe('−£1,200');
    expect(moneyChange(20, 'GBP')).toBe('£0');
  });

  it('rounds to the shown value for every amount (property: money(x) is the text of roundMoney(x))', () => {
    fc.assert(
      fc.property(fc.double({ min: -1e8, max: 1e8, noNaN: true }), (x) => {
        const r = roundMoney(x, 'pot');
        const step = Math.abs(x) < 10_000 ? 100 : 1000;
        expect(Math.abs(r - x)).toBeLessThanOrEqual(step / 2 + 1e-6);
        expect(Math.abs(r % step)).toBe(0);
        expect(Number(money(x, 'GBP').replace(/[£,]/g, '').replace('−', '-'))).toBe(r === 0 ? 0 : r);
      }),
    );
  });

  it('writes compact axis amounts', () => {
    expect(compactMoney(200_000, 'GBP')).toBe('£200k');
    expect(compactMoney(1_500_000, 'GBP')).toBe('£1.5m');
    expect(compactMoney(0, 'GBP')).toBe('£0');
  });
});

describe('percentages, λ and counts', () => {
  it.each([
    [0.0725, 'rate', '7.25%'],
    [0.0045, 'rate', '0.45%'],
    [0.00125, 'rate', '0.125%'],
    [0.5, 'rate', '50%'],
    [0.034123, 'return', '3.41%'],
    [0.6249, 'chance', '62%'],
    [0.011, 'chanceError', '1.1%'],
    [0.125, 'share', '12.5%'],
    [0.4, 'share', '40%'],
    [-0.012, 'rate', '−1.2%'],
  ] as const)('%d as a %s reads %s', (v, context, text) => {
    expect(percent(v, context)).toBe(text);
  });

  it('words a difference of rates in percentage points', () => {
    expect(percentagePoints(0.62 - 0.5)).toBe('+12 percentage points');
    expect(percentagePoints(-0.04)).toBe('−4 percentage points');
    expect(percentagePoints(0.01)).toBe('+1 percentage point');
    expect(percentagePoints(0.001)).toBe('0 percentage points');
  });

  it('trims λ and groups counts', () => {
    expect([lambda(2), lambda(1.5), lambda(1.5625), lambda(-0.5)]).toEqual(['2', '1.5', '1.56', '−0.5']);
    expect(count(10_000)).toBe('10,000');
    expect(percentileLabel(50)).toBe('Median');
    expect(percentileLabel(5)).toBe('5th');
  });
});

describe('percentages typed at the edge', () => {
  it('stores 0.45% as exactly 0.0045, where dividing by 100 leaves noise', () => {
    expect(0.45 / 100).not.toBe(0.0045); // 0.0045000000000000005 in IEEE 754 doubles
    expect(parsePercentInput('0.45')).toBe(0.0045);
    expect(parsePercentInput('0.45 %')).toBe(0.0045);
  });

  it.each([
    ['7', 0.07],
    ['12.5', 0.125],
    ['100', 1],
    ['-3', -0.03],
    ['.5', 0.005],
    ['1234.5', 12.345],
    ['0', 0],
  ])('reads "%s" as %d', (text, value) => {
    expect(parsePercentInput(text)).toBe(value);
  });

  it.each(['', 'abc', '1e3', '5..', '%'])('refuses "%s"', (text) => {
    expect(parsePercentInput(text)).toBeNull();
  });

  it('round-trips every percentage with up to four decimals (property)', () => {
    fc.assert(
      fc.property(fc.integer({ min: -1_000_000, max: 1_000_000 }), (n) => {
        const text = (n / 10_000).toString();
        const f = parsePercentInput(text)!;
        // The stored fraction is the double nearest the decimal the person typed …
        expect(f).toBe(Number(`${n}e-6`));
        // … and it shows in the box as typed.
        expect(percentInputText(f)).toBe(String(Number(text)));
      }),
    );
  });

  it('reads percentages in uploaded CSV cells the same way', () => {
    expect(numberCell('0.45%', { percent: true })).toBe(0.0045);
    expect(numberCell('8.3 %', { percent: true })).toBe(0.083);
    expect(numberCell('0.083', { percent: true })).toBe(0.083);
    expect(numberCell('1e2%', { percent: true })).toMatch(/not a percentage/);
  });

  it('reads plain numbers with thousands separators', () => {
    expect(parseNumberInput('32,500')).toBe(32_500);
    expect(parseNumberInput(' 7.5 ')).toBe(7.5);
    expect(parseNumberInput('7,5')).toBeNull();
  });
});

describe('dates, one format', () => {
  it('writes calendar dates as the day they name', () => {
    expect(date('2026-12-02')).toBe('2 December 2026');
    expect(date(null)).toBe('—');
    expect(date('not a date')).toBe('—');
  });

  it('writes moments in UK time, summer and winter', () => {
    // 23:30 UTC on 30 June is 00:30 on 1 July in British Summer Time.
    expect(dateTime('2026-06-30T23:30:00Z')).toBe('1 July 2026, 00:30');
    expect(date(new Date('2026-06-30T23:30:00Z'))).toBe('1 July 2026');
    expect(dateTime('2026-12-02T14:05:00Z')).toBe('2 December 2026, 14:05');
  });

  it('counts whole calendar days between two dates, across a change of clocks and a leap day', () => {
    expect(daysBetween('2026-03-28', '2026-03-30')).toBe(2); // BST starts on 29 March 2026
    expect(daysBetween('2028-02-28', '2028-03-01')).toBe(2);
    expect(daysBetween('2027-06-30', '2027-03-31')).toBe(-91);
    expect(daysBetween('2026-12-02', '2026-12-02')).toBe(0);
  });
});

describe('axis ticks from d3-scale', () => {
  it('extends a money axis to a round top (d3 nice) and labels it compactly', () => {
    const a = moneyAxis(812_345, 'GBP');
    expect(a.max).toBe(1_000_000);
    expect(a.ticks).toEqual([0, 200_000, 400_000, 600_000, 800_000, 1_000_000]);
    expect(a.ticks.map(a.label)).toEqual(['£0', '£200k', '£400k', '£600k', '£800k', '£1m']);
  });

  it('labels a growth axis with just enough decimals', () => {
    const a = valueAxis(0.83, 1.37);
    expect(a.ticks.map(a.label)).toEqual(['0.8', '1.0', '1.2', '1.4']);
    expect([a.min, a.max]).toEqual([0.8, 1.4]);
  });

  it('gives whole-number ages', () => {
    expect(wholeTicks(40, 67)).toEqual([40, 45, 50, 55, 60, 65]);
    expect(wholeTicks(64, 67).every(Number.isInteger)).toBe(true);
  });
});

describe('differences to the baseline', () => {
  it('is too close to call only when within two standard errors, and unknown without one', () => {
    expect(SEPARATION_Z).toBe(2);
    expect(difference(-3000)).toEqual({ value: -3000, standardError: null, tooCloseToCall: null });
    expect(difference(-3000, 1000).tooCloseToCall).toBe(false);
    expect(difference(-1900, 1000).tooCloseToCall).toBe(true);
  });

  it('takes the engine’s paired differences as they are, and says when one is inside the noise', () => {
    const pot = (rank: number, name: string, ce: number, p50: number, p5: number, chance: number) =>
      ({ rank, optionId: name, name, ce: { pot: ce, standardError: 1, annualReturn: 0.02, basis: 'run' }, pair: { atRetirement: { percentiles: { real: { p50, p5 } }, probabilityReachingTarget: chance } } }) as unknown as RankedOption;
    const ranked = [pot(1, 'Steady', 150_000, 190_000, 99_000, 0.08), pot(2, 'Spread', 144_000, 212_000, 87_000, 0.2)];
    const engine = { value: 0, standardError: 4_000, tooCloseToCall: true, pathsToSeparate: 12_000 };
    const [d] = differencesToBaseline(ranked, 'Steady', (_o, _b, figure) => (figure === 'ce' ? engine : figure === 'median' ? 9_000 : null));
    expect(d.ce).toEqual({ ...engine, value: -6_000 });
    expect(d.median).toEqual({ value: 22_000, standardError: 9_000, tooCloseToCall: false });
    expect(d.chance?.tooCloseToCall).toBeNull();
    expect(differenceSentence(d, 'Steady', 'GBP')).toBe(
      'Spread against Steady: certainty-equivalent pot −£6,000 ± £4,000 (not separated by the simulation noise), median pot +£22,000 ± £9,000, chance of reaching the income target +12 percentage points.',
    );
  });
});

describe('the baseline: the scheme’s current default', () => {
  const rows = [{ optionId: 'a', name: 'Alpha' }, { optionId: 'b', name: 'Beta' }, { optionId: 'c', name: 'Gamma' }];

  it('is pinned first, the others keeping their order; nothing moves without one among the rows', () => {
    expect(pinFirst(rows, 'c').map((r) => r.optionId)).toEqual(['c', 'a', 'b']);
    expect(pinFirst(rows, 'a').map((r) => r.optionId)).toEqual(['a', 'b', 'c']);
    expect(pinFirst(rows, 'elsewhere')).toBe(rows);
    expect(pinFirst(rows, null)).toBe(rows);
  });

  it('is what differences are measured from, else the top-ranked option, and says which', () => {
    expect(baselineOf(rows, 'b')?.name).toBe('Beta');
    expect(baselineOf(rows, 'elsewhere')?.name).toBe('Alpha');
    expect(baselineOf([], 'b')).toBeUndefined();
    expect(baselineSentence(rows[1], 'b')).toMatch(/^Beta was the scheme's current default when this run was made: it is shown first/);
    expect(baselineSentence(undefined, 'elsewhere')).toMatch(/not among its options: differences are measured from the top-ranked option/);
    expect(baselineSentence(undefined, null)).toMatch(/^No option was marked as the current default/);
  });
});


// ---- Exact figures at λ: the too-close band, the paths estimate, the break-even table -----------

/** An engine paired difference (A − B) as the comparison endpoint returns it. */
const engineDiff = (value: number, se: number | null, paths: number) => ({ value, standardError: se, ...separation(value, se, paths) });

/** Three invented options for one member: Steady leads Spread inside the noise; Spread leads Cautious clearly. */
function threeOptions(paths = 10_000) {
  const pair = (optionId: string, p50: number, chance: number | null) =>
    ({ optionId, memberId: 'm', atRetirement: { percentiles: { real: { p50, p5: p50 / 2 } }, probabilityReachingTarget: chance }, extraStandardErrors: { p50Real: 900, p5Real: 700, probabilityReachingTarget: chance === null ? null : 0.011 } });
  const variant = { result: { paths, riskAversion: 2, results: [pair('spread', 200_000, 0.4), pair('steady', 190_000, 0.35), pair('cautious', 170_000, 0.2)] } } as unknown as StoredVariant;
  const ce = (optionId: string, realPot: number, standardError: number) => ({ optionId, memberId: 'm', certaintyEquivalent: { realPot, realAnnualReturn: 0.03, standardError } });
  const cmp = (optionA: string, optionB: string, d: number, se: number) => ({
    memberId: 'm',
    optionA,
    optionB,
    lambda: 5,
    certaintyEquivalent: engineDiff(d, se, paths),
    medianPot: engineDiff(d * 2, se * 3, paths),
    probabilityReachingTarget: engineDiff(0.05, 0.01, paths),
  });
  const ex: ExactFigures = {
    lambda: 5,
    paths,
    pairs: [ce('spread', 150_000, 1_500), ce('steady', 151_000, 1_400), ce('cautious', 146_000, 900)],
    // Stored once per pair in option order (A − B): spread − steady = −1,000 (SE 600: inside 2 SE), spread − cautious = +4,000 (SE 1,000: outside).
    differences: [cmp('spread', 'steady', -1_000, 600), cmp('spread', 'cautious', 4_000, 1_000), cmp('steady', 'cautious', 5_000, 1_100)],
  };
  return { variant, ex };
}

describe('ranking at λ from exact figures', () => {
  it('orders by CE, orients each paired difference and marks a lead within 2 standard errors as too close to call', () => {
    const { variant, ex } = threeOptions();
    const ranked = rankAt(variant, ex, 'm', { spread: 'Spread', steady: 'Steady', cautious: 'Cautious' });
    expect(ranked.map((r) => `${r.rank}. ${r.name}`)).toEqual(['1. Steady', '2. Spread', '3. Cautious']);
    // Stored as spread − steady = −1,000; read the other way round it is +1,000.
    expect(pairedDifference(ex, 'm', 'steady', 'spread', 'ce')?.value).toBe(1_000);
    expect(ranked[0].toNext).toMatchObject({ value: 1_000, standardError: 600, tooCloseToCall: true });
    expect(ranked[1].toNext).toMatchObject({ value: 4_000, standardError: 1_000, tooCloseToCall: false });
    expect(ranked[2].toNext).toBeNull();
    expect(leadCell(ranked[0], 'GBP')).toEqual({ text: '+£1,000', standardError: '± £600', mark: TOO_CLOSE_TEXT, exact: 1_000, exactStandardError: 600 });
    expect(leadCell(ranked[1], 'GBP')?.mark).toBeNull();
    // 10,000 · (2 · 600 / 1,000)² = 14,400 → 15,000 (two significant figures, rounded up).
    expect(tooCloseLines(ranked)).toEqual(['Steady (1st) and Spread (2nd): too close to call at this number of paths; about 15,000 paths would separate them.']);
  });

  it('never names a winner inside the noise, and says who leads when the lead is outside it', () => {
    const { variant, ex } = threeOptions();
    const ranked = rankAt(variant, ex, 'm', { spread: 'Spread', steady: 'Steady', cautious: 'Cautious' });
    const close = leadSentence(ranked, 'GBP', ex.paths)!;
    expect(close).toBe('Steady and Spread are not separated by the simulation noise: their certainty-equivalent pots differ by £1,000 ± £600 at 10,000 paths (about 15,000 paths would separate them), so neither should be called the better on this run.');
    expect(close).not.toMatch(/highest|ahead|leads|better than/);
    expect(leadSentence(ranked.slice(1), 'GBP', ex.paths)).toBe('Spread has the highest certainty-equivalent pot, ahead of Cautious by £4,000 ± £1,000: more than twice the Monte Carlo standard error.');
    // No standard error (a run stored before paired comparisons): no winner either.
    const unknown = [{ ...ranked[1], toNext: difference(4_000) }, ranked[2]];
    expect(leadSentence(unknown, 'GBP', ex.paths)).toMatch(/^Spread and Cautious differ by £4,000 in certainty-equivalent pot; this run gives no standard error for the difference, so neither is called the better\.$/);
  });

  it('shows the differences to the baseline ± their standard errors, and "no target set" when the run has no target', () => {
    const { variant, ex } = threeOptions();
    const ranked = rankAt(variant, ex, 'm', { spread: 'Spread', steady: 'Steady', cautious: 'Cautious' });
    const [spread] = differencesToBaseline(ranked, 'spread', (o, b, f) => (f === 'p5' ? null : pairedDifference(ex, 'm', o, b, f)));
    expect(spread.optionId).toBe('steady');
    const cells = differenceCells(spread, 'GBP');
    expect([cells.ce.text, cells.ce.standardError, cells.ce.tooCloseToCall]).toEqual(['+£1,000', '± £600', true]);
    expect([cells.chance.text, cells.chance.standardError]).toEqual(['−5 percentage points', '± 1.0 percentage point']);
    expect(differenceCells({ ...spread, chance: null }, 'GBP').chance.text).toBe(NO_TARGET_TEXT);
    expect(NO_TARGET_TEXT).toBe('no target set');
  });
});

describe('the paths-needed estimate', () => {
  // Formula: the standard error shrinks as 1/√n, so a difference d with standard error s at n paths
  // reaches 2 standard errors at n·(2s/|d|)² paths; shown rounded up to two significant figures.
  it.each([
    [1_000, 600, 10_000, 15_000],
    [100, 80, 1_000, 2_600],
    [-300, 500, 2_000, 23_000],
  ])('d = %d, SE = %d at %d paths → about %d paths', (d, se, n, expected) => {
    const raw = n * ((2 * se) / Math.abs(d)) ** 2;
    const x = difference(d, se, n);
    expect(x.tooCloseToCall).toBe(true);
    expect(x.pathsToSeparate).toBe(expected);
    expect(x.pathsToSeparate!).toBeGreaterThanOrEqual(raw);
    expect(tooCloseNote(x)).toBe(`Too close to call at this number of paths: about ${count(expected)} paths would separate them.`);
  });

  it('has the band edge at exactly two standard errors, and no estimate for a separated or zero difference', () => {
    expect(difference(2_000, 1_000, 5_000)).toMatchObject({ tooCloseToCall: false, pathsToSeparate: null });
    expect(difference(1_999, 1_000, 5_000).tooCloseToCall).toBe(true);
    expect(difference(0, 1_000, 5_000)).toMatchObject({ tooCloseToCall: true, pathsToSeparate: null });
    expect(tooCloseNote(difference(0, 1_000, 5_000))).toBe('Too close to call at this number of paths.');
    expect(tooCloseNote(difference(2_000, 1_000, 5_000))).toBeNull();
  });
});

describe('the break-even table', () => {
  const names = { a: 'Steady', b: 'Spread', c: 'Cautious' };
  const members = { m: 'Mid career' };
  const crossing = (lambda: number, lo: number, hi: number) => ({ lambda, standardError: (hi - lo) / 3.92, interval: [lo, hi] as [number, number], favouredAbove: 'A' as const });

  it('gives one row per member and pair: none, one crossing or several, each with its interval', () => {
    const rows = breakEvenRows(
      [
        { memberId: 'm', optionA: 'a', optionB: 'b', status: 'none-in-range', lambda: null, crossings: [] },
        { memberId: 'm', optionA: 'a', optionB: 'c', status: 'found', lambda: 1.571, crossings: [crossing(1.571, 1.402, 1.744)] },
        { memberId: 'm', optionA: 'b', optionB: 'c', status: 'found', lambda: 0.83, crossings: [crossing(20, 17.5, 23.25), crossing(0.83, 0.7, 0.95), crossing(60, 55, 65)] },
      ],
      names,
      members,
    );
    expect(rows.map((r) => [r.member, r.options, r.kind, r.text])).toEqual([
      ['Mid career', 'Steady and Spread', 'none', 'none from −5 to 50'],
      ['Mid career', 'Steady and Cautious', 'crossings', '1.57 (1.4 to 1.74)'],
      // Ascending, and the crossing outside the board's range [−5, 50] left out.
      ['Mid career', 'Spread and Cautious', 'crossings', '0.83 (0.7 to 0.95); 20 (17.5 to 23.25)'],
    ]);
    expect(rows[2].lambdas).toEqual([0.83, 20]);
    expect(BREAK_EVEN_COLUMNS.map((c) => c.label)).toEqual(['Member', 'Options', 'Break-even λ (95% interval)']);
  });

  it('reads entries of runs stored before every crossing was kept, and identical options', () => {
    const [old, same] = breakEvenRows(
      [
        { memberId: 'm', optionA: 'a', optionB: 'b', status: 'found', lambda: 2.4 },
        { memberId: 'm', optionA: 'a', optionB: 'c', status: 'identical', lambda: null, crossings: [] },
      ],
      names,
      members,
    );
    expect(old.text).toBe('2.4');
    expect(same).toMatchObject({ kind: 'identical', text: 'same pot on every path' });
  });
});

describe('figures a run stored at its own λ', () => {
  it('are the engine’s full-sample certainty equivalents and paired comparisons', () => {
    const variant = {
      result: {
        riskAversion: 2,
        paths: 500,
        results: [{ optionId: 'a', memberId: 'm', atRetirement: { certaintyEquivalent: { realPot: 120_000, realAnnualReturn: 0.021 }, uncertainty: { certaintyEquivalent: { realPot: 800 } } } }],
        comparisons: [],
      },
    } as unknown as StoredVariant;
    expect(storedFigures(variant)).toEqual({ lambda: 2, paths: 500, pairs: [{ optionId: 'a', memberId: 'm', certaintyEquivalent: { realPot: 120_000, realAnnualReturn: 0.021, standardError: 800 } }], differences: [] });
  });
});
