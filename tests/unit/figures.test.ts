import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  baselineOf,
  baselineSentence,
  breakEvenSentence,
  ceStandardError,
  compactMoney,
  count,
  crossingsOf,
  date,
  dateTime,
  daysBetween,
  difference,
  differenceSentence,
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
import { certaintyEquivalentPot } from '../../simulation';
import { numberCell } from '../../server/uploads';
import { sampleVariance } from '../../simulation/statistics';

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

describe('certainty-equivalent standard error', () => {
  it('at λ = 0 is the standard error of the mean, s/√n with the n − 1 variance (textbook formula)', () => {
    const pots = Array.from({ length: 500 }, (_, i) => 50_000 + ((i * 7919) % 1000) * 120);
    expect(ceStandardError(pots, 0, pots.length)).toBeCloseTo(Math.sqrt(sampleVariance(pots) / pots.length), 6);
  });

  it('at λ = ½ (log utility) is CE · sd(ln W)/√n', () => {
    const pots = Array.from({ length: 400 }, (_, i) => 30_000 * Math.exp(((i % 40) - 20) / 40));
    const logs = pots.map(Math.log);
    const expected = (certaintyEquivalentPot(pots, 0.5) * Math.sqrt(sampleVariance(logs))) / Math.sqrt(pots.length);
    expect(ceStandardError(pots, 0.5, pots.length)).toBeCloseTo(expected, 6);
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
      'Spread against Steady: certainty-equivalent pot −£6,000 (within sampling error; about 12,000 paths would separate it), median pot +£22,000, 5th percentile pot −£12,000, chance of reaching the income target +12 percentage points.',
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

describe('break-even sentences', () => {
  // Two invented samples: Steady narrow, Spread wide with a higher mean; they cross once, near λ = 0.83.
  const steady = Array.from({ length: 200 }, (_, i) => 100_000 + (i % 10) * 1_000);
  const spread = Array.from({ length: 200 }, (_, i) => 40_000 + (i % 20) * 9_000);
  const base = { a: { name: 'Steady', pots: steady }, b: { name: 'Spread', pots: spread }, lambda: 2 };

  it('reads an engine entry with one crossing or a list of them', () => {
    expect(crossingsOf({ status: 'found', lambda: 1.2 })).toEqual({ status: 'crossings', lambdas: [1.2] });
    expect(crossingsOf({ status: 'found', lambdas: [8, 0.5, 99] })).toEqual({ status: 'crossings', lambdas: [0.5, 8] });
    expect(crossingsOf({ status: 'none-in-range', lambda: null })).toEqual({ status: 'none', lambdas: [] });
    expect(crossingsOf({ status: 'identical', lambda: null }).status).toBe('identical');
    expect(crossingsOf({ status: 'found', lambda: 0.5, crossings: [{ lambda: 0.5 }, { lambda: 7 }] }).lambdas).toEqual([0.5, 7]);
  });

  it('words no crossing, one crossing and several crossings in one way', () => {
    expect(breakEvenSentence({ ...base, crossings: { status: 'none', lambdas: [] } })).toBe('Steady ranks above Spread at every λ from −5 to 50.');
    const one = breakEvenSentence({ ...base, memberLabel: 'Mid career', crossings: { status: 'crossings', lambdas: [0.83] } });
    expect(one).toBe('For Mid career, Spread ranks above Steady when λ is below 0.83; from 0.83, Steady ranks higher. At the chosen λ = 2, Steady ranks higher.');
    // Several crossings (as a later engine may report): each interval names its leader, read from the samples.
    const several = breakEvenSentence({ ...base, crossings: { status: 'crossings', lambdas: [0.83, 3, 20] } });
    expect(several).toBe('Spread ranks above Steady when λ is below 0.83; from 0.83 to 3, Steady ranks higher; from 3 to 20, Steady ranks higher; from 20, Steady ranks higher. At the chosen λ = 2, Steady ranks higher.');
    expect(breakEvenSentence({ ...base, crossings: { status: 'identical', lambdas: [] } })).toBe('Steady and Spread give the same pot on every path, so neither ranks above the other at any λ.');
  });
});
