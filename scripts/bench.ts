/**
 * Projection engine benchmark (prints figures; not a test).
 *
 *   npm run bench            (this, then scripts/bench-runs.ts: request to stored result)
 *   npx tsx scripts/bench.ts
 *
 * Everything is measured side by side in one run, on scenario format 2 with its default
 * conventions (mid-year weights, spread contributions):
 * 1. market generation — every fund's gross return for 100,000 paths × 40 years × 3 funds
 *    (normals → correlation → exp), against the numpy reference (scripts/bench_reference.py,
 *    one thread) when python3 with numpy is on the machine;
 * 2. the member walk over a generated market: option × member path-years a second, with the
 *    engine's layout (paths innermost) and the alternative (years innermost) side by side;
 * 3. the full run of 1 option × 1 member × 100,000 paths × 40 years (bands at every age,
 *    percentiles, CE, standard errors, CE curve), against engine 1.0.0 and numpy;
 * 4. a comparison: 5 options × 3 members × 10,000 paths, full run on one thread;
 * 5. two worker threads against one (the full run of 3);
 * 6. memory per path-year.
 * Each figure is the best of several runs, as wall-clock time and as CPU time of this process
 * (process.cpuUsage; steadier when other work shares the cores). Targets (issue 16, on a
 * 2-core machine): market ≥ 1.0× numpy; walk ≥ 100 M option-member path-years/s; full run
 * ≥ 3× engine 1.0.0; comparison < 150 ms; 2 threads ≥ 1.8× one; memory per path-year no more
 * than engine 1.0.0's.
 */
import { spawnSync } from 'node:child_process';
import { availableParallelism, loadavg } from 'node:os';
import path from 'node:path';

import { ComputePool, runScenarioThreaded } from '../server/compute/threads';
import {
  BLOCK_PATHS,
  bandBytes,
  createPairStores,
  createWalkScratch,
  fastExp,
  marketFor,
  parseScenario,
  prepareScenario,
  runMemberComparison,
  runScenario,
  simulateRange,
  summarisePair,
  walkPair,
  Xoshiro128,
  type PreparedScenario,
  type ScenarioInput,
} from '../simulation';
import { SPREAD } from '../simulation/fastMath';
import { zigguratNormals } from '../simulation/ziggurat';

/** Engine 1.0.0 on this machine, measured side by side with numpy when issue 16 was filed (M path-years/s, one thread). */
const ENGINE_ONE = { pathLoop: [5.1, 7.0], fullRun: [3.5, 4.2], comparisonMs: 620 };

const funds = [
  { id: 'eq', name: 'Bench Equity', expectedReturn: 0.07, volatility: 0.16, annualCharge: 0.003 },
  { id: 'dg', name: 'Bench Diversified', expectedReturn: 0.05, volatility: 0.1, annualCharge: 0.004 },
  { id: 'bd', name: 'Bench Bonds', expectedReturn: 0.03, volatility: 0.05, annualCharge: 0.002 },
];
const correlations = [
  [1, 0.7, 0.1],
  [0.7, 1, 0.25],
  [0.1, 0.25, 1],
];
function option(id: string, switchYears: number): ScenarioInput['options'][number] {
  return {
    id,
    name: id,
    glidePath: [
      { yearsToRetirement: switchYears, weights: { eq: 0.8, dg: 0.2 } },
      { yearsToRetirement: 0, weights: { dg: 0.3, bd: 0.7 } },
    ],
  };
}
const member = (id: string, age: number) => ({ id, age, retirementAge: 65, salary: 32000, salaryGrowth: 0.03, contributionRate: 0.08, pot: 2000 });
const common = {
  version: 2 as const,
  seed: 2024,
  inflation: 0.025,
  funds,
  correlations,
  riskAversion: 1.5,
  targetReplacementRatio: 0.3,
  annuity: { realRate: 0.01, years: 25 },
};
const single: ScenarioInput = { ...common, paths: 100000, options: [option('lifestyle', 12)], members: [member('m25', 25)] };
const comparison: ScenarioInput = {
  ...common,
  paths: 10000,
  options: [option('o5', 5), option('o8', 8), option('o10', 10), option('o15', 15), option('o20', 20)],
  members: [member('age25', 25), member('age40', 40), member('age55', 55)],
};
const PATH_YEARS = 100000 * 40;

type Time = { wallMs: number; cpuMs: number };
const mib = (bytes: number) => `${(bytes / 1048576).toFixed(1)} MiB`;
const ms = (t: Time) => `${t.wallMs.toFixed(0)} ms (CPU ${t.cpuMs.toFixed(0)} ms)`;
const rate = (units: number, t: number) => (units / t) * 1000;
const m = (x: number) => `${(x / 1e6).toFixed(1)} M`;

function best(runs: number, fn: () => void): Time {
  let wallMs = Infinity;
  let cpuMs = Infinity;
  for (let k = 0; k < runs; k++) {
    const c0 = process.cpuUsage();
    const t0 = performance.now();
    fn();
    wallMs = Math.min(wallMs, performance.now() - t0);
    const c = process.cpuUsage(c0);
    cpuMs = Math.min(cpuMs, (c.user + c.system) / 1000);
  }
  return { wallMs, cpuMs };
}

async function bestAsync(runs: number, fn: () => Promise<unknown>): Promise<number> {
  let wallMs = Infinity;
  for (let k = 0; k < runs; k++) {
    const t0 = performance.now();
    await fn();
    wallMs = Math.min(wallMs, performance.now() - t0);
  }
  return wallMs;
}

/** The numpy reference, pinned to one thread; null when python3 or numpy is missing. */
function numpyReference(): { numpy: string; market: Time; walk: Time; full: Time } | null {
  const script = path.join(__dirname, 'bench_reference.py');
  const env = { ...process.env, OPENBLAS_NUM_THREADS: '1', OMP_NUM_THREADS: '1', MKL_NUM_THREADS: '1' };
  const r = spawnSync('python3', [script], { encoding: 'utf8', env, timeout: 600_000 });
  if (r.status !== 0 || !r.stdout.trim()) return null;
  return JSON.parse(r.stdout);
}

/**
 * The alternative layout, years innermost: each path's gross returns contiguous
 * ([path × years × funds + year × funds + fund]) and each pair walked path by path. Same draws
 * and arithmetic as the engine's format 2; measured here only, to compare the layouts.
 */
function yearsInnermost(prepared: PreparedScenario, paths: number, gross: Float64Array) {
  const { fundCount: F, maxYears: Y, mu, scaledChol: A } = prepared;
  const D = Y * F;
  const g = new Xoshiro128();
  const z = new Float64Array(D);
  return {
    market(first: number, count: number) {
      for (let j = 0; j < count; j++) {
        zigguratNormals(g.seed(prepared.scenario.seed, first + j), z, D);
        const o = j * D;
        for (let y = 0; y < Y; y++) {
          const b = y * F;
          for (let i = F - 1; i >= 0; i--) {
            let s = mu[i];
            for (let k = 0; k <= i; k++) s += A[i * F + k] * z[b + k];
            gross[o + b + i] = fastExp(s);
          }
        }
      }
    },
    walk(pairIndex: number, first: number, count: number, bands: Float32Array, terminal: Float64Array) {
      const pair = prepared.pairs[pairIndex];
      const n = pair.years;
      const w = pair.weights;
      const cf = pair.chargeFactor;
      const c = pair.timeline.contributions;
      const t = SPREAD.table;
      for (let j = 0; j < count; j++) {
        let pot = pair.timeline.initialPot;
        const o = j * D;
        for (let y = 0; y < n; y++) {
          const b = y * F;
          const q = (w[b] * gross[o + b] + w[b + 1] * gross[o + b + 1] + w[b + 2] * gross[o + b + 2]) * cf[y];
          const u = (q - SPREAD.low) * SPREAD.cellsPerUnit;
          const cell = u | 0;
          const d = u - cell - 0.5;
          const s = t[4 * cell] + t[4 * cell + 1] * d + d * d * (t[4 * cell + 2] + t[4 * cell + 3] * d);
          pot = pot * q + c[y] * s;
          if (y < n - 1) bands[y * paths + first + j] = pot;
        }
        terminal[first + j] = pot;
      }
    },
  };
}

async function main(): Promise<void> {
  const cores = availableParallelism();
  console.log(`Keelson projection benchmark — Node ${process.version}, ${cores} cores, load average ${loadavg().map((l) => l.toFixed(1)).join(' ')}`);
  console.log('Figures are the best of several runs, wall clock and CPU time; on a shared machine they are noisy (CPU time is steadier) — rerun on a quiet machine for the targets.');
  console.log('Case: 100,000 paths × 40 years × 3 correlated funds, scenario format 2 (mid-year weights, spread contributions).');
  const reference = numpyReference();
  console.log(reference ? `numpy reference: numpy ${reference.numpy}, one thread (scripts/bench_reference.py)` : 'numpy reference: python3 with numpy not found — skipped');

  // 1. Market generation.
  const prepared = prepareScenario(parseScenario(single));
  const gross = new Float64Array(prepared.maxYears * prepared.fundCount * BLOCK_PATHS);
  const market = marketFor(prepared);
  const fillAll = () => {
    for (let first = 0; first < 100000; first += BLOCK_PATHS) market.fill(first, Math.min(BLOCK_PATHS, 100000 - first), gross, BLOCK_PATHS);
  };
  fillAll();
  const marketTime = best(5, fillAll);
  console.log(`\n1. market generation (normals → correlation → exp), one thread: ${ms(marketTime)} = ${m(rate(PATH_YEARS, marketTime.wallMs))} path-years/s`);
  if (reference) {
    console.log(`   numpy reference: ${ms(reference.market)} = ${m(rate(PATH_YEARS, reference.market.wallMs))} path-years/s`);
    console.log(`   engine ÷ numpy speed: ${(reference.market.wallMs / marketTime.wallMs).toFixed(2)}× wall, ${(reference.market.cpuMs / marketTime.cpuMs).toFixed(2)}× CPU (target ≥ 1.0×)`);
  }

  // 2. Member walk over a generated market: 5 options × 3 members over 8,192 stored paths.
  const cmp = prepareScenario(parseScenario({ ...comparison, paths: 8192 }));
  const blocks = 8192 / BLOCK_PATHS;
  const stored = Array.from({ length: blocks }, (_, b) => {
    const block = new Float64Array(cmp.maxYears * cmp.fundCount * BLOCK_PATHS);
    marketFor(cmp).fill(b * BLOCK_PATHS, BLOCK_PATHS, block, BLOCK_PATHS);
    return block;
  });
  const stores = createPairStores(cmp, cmp.pairs.map((p) => p.pairIndex));
  const scratch = createWalkScratch();
  const walkAll = () => {
    for (let b = 0; b < blocks; b++) for (const store of stores) walkPair(cmp, store, stored[b], b * BLOCK_PATHS, BLOCK_PATHS, scratch);
  };
  const pairYears = 8192 * cmp.pairs.reduce((s, p) => s + p.years, 0);
  walkAll();
  const walkTime = best(7, walkAll);
  const alt = new Float64Array(8192 * cmp.maxYears * cmp.fundCount);
  const years = yearsInnermost(cmp, 8192, alt);
  years.market(0, 8192);
  const altStores = createPairStores(cmp, cmp.pairs.map((p) => p.pairIndex));
  const altWalk = () => {
    for (const s of altStores) years.walk(s.pairIndex, 0, 8192, s.bands!, s.terminal);
  };
  altWalk();
  const altTime = best(7, altWalk);
  console.log(`\n2. member walk over a generated market, 15 option × member pairs (5 × 3, 40/25/10 years), one thread:`);
  console.log(`   paths innermost (the engine): ${ms(walkTime)} = ${m(rate(pairYears, walkTime.wallMs))} option-member path-years/s (CPU ${m(rate(pairYears, walkTime.cpuMs))}; target ≥ 100 M)`);
  console.log(`   years innermost (alternative): ${ms(altTime)} = ${m(rate(pairYears, altTime.wallMs))} option-member path-years/s (CPU ${m(rate(pairYears, altTime.cpuMs))})`);
  if (reference) console.log(`   numpy reference (1 option × member over 100,000 paths): ${ms(reference.walk)} = ${m(rate(PATH_YEARS, reference.walk.wallMs))} path-years/s`);
  const altMarket = best(3, () => years.market(0, 8192));
  console.log(`   market step in the years-innermost layout: ${m(rate(8192 * 40, altMarket.wallMs))} path-years/s (engine layout: ${m(rate(PATH_YEARS, marketTime.wallMs))})`);

  // 3. Full run, one thread.
  runScenario({ ...single, paths: 20000 });
  const fullTime = best(3, () => runScenario(single));
  const full = rate(PATH_YEARS, fullTime.wallMs);
  console.log(`\n3. full run (bands at every age, percentiles, CE, standard errors, CE curve), one thread: ${ms(fullTime)} = ${m(full)} path-years/s`);
  console.log(
    `   engine 1.0.0 (recorded when issue 16 was filed, machine not loaded): ${ENGINE_ONE.fullRun.join('–')} M path-years/s → ${(full / 1e6 / ENGINE_ONE.fullRun[1]).toFixed(1)}–${(full / 1e6 / ENGINE_ONE.fullRun[0]).toFixed(1)}× by wall clock, ${(rate(PATH_YEARS, fullTime.cpuMs) / 1e6 / ENGINE_ONE.fullRun[1]).toFixed(1)}–${(rate(PATH_YEARS, fullTime.cpuMs) / 1e6 / ENGINE_ONE.fullRun[0]).toFixed(1)}× by CPU time (target ≥ 3×)`,
  );
  const phases = phaseTimes(single);
  console.log(`   phases (CPU): simulate ${phases.simulate.toFixed(0)} ms, summarise ${phases.summarise.toFixed(0)} ms, compare ${phases.compare.toFixed(0)} ms`);
  if (reference) {
    console.log(`   numpy reference full run: ${ms(reference.full)} → engine ÷ numpy ${(reference.full.wallMs / fullTime.wallMs).toFixed(2)}× wall, ${(reference.full.cpuMs / fullTime.cpuMs).toFixed(2)}× CPU`);
  }
  const formatOne = best(2, () => runScenario({ ...single, version: 1 }));
  console.log(`   the same run in scenario format 1 (engine 1's random numbers, kept for old runs): ${ms(formatOne)} = ${m(rate(PATH_YEARS, formatOne.wallMs))} path-years/s`);

  // 4. Comparison.
  runScenario({ ...comparison, paths: 2000 });
  const compTime = best(7, () => runScenario(comparison));
  const compPhases = phaseTimes(comparison);
  console.log(
    `\n4. comparison 5 options × 3 members × 10,000 paths, full run on one thread (30 option pairs: every break-even crossing, paired differences): ${ms(compTime)} (target < 150 ms; engine 1.0.0: about ${ENGINE_ONE.comparisonMs} ms)`,
  );
  console.log(`   phases (CPU): simulate ${compPhases.simulate.toFixed(0)} ms, summarise ${compPhases.summarise.toFixed(0)} ms, compare ${compPhases.compare.toFixed(0)} ms`);

  // 5. Threads.
  const pool = new ComputePool(2);
  await runScenarioThreaded({ ...single, paths: 40000 }, { pool });
  const oneThread = await bestAsync(3, async () => runScenario(single));
  const twoThreads = await bestAsync(3, () => runScenarioThreaded(single, { pool }));
  const timing = { simulateMs: 0, summariseMs: 0, compareMs: 0 };
  await runScenarioThreaded(single, { pool, timing });
  const compTwo = await bestAsync(5, () => runScenarioThreaded(comparison, { pool }));
  await pool.close();
  console.log(`\n5. two worker threads (warm pool; all phases in the workers), full run of 3: ${twoThreads.toFixed(0)} ms vs ${oneThread.toFixed(0)} ms on one thread = ${(oneThread / twoThreads).toFixed(2)}× (target ≥ 1.8×)`);
  console.log(`   phases: simulate ${timing.simulateMs.toFixed(0)} ms, summarise ${timing.summariseMs.toFixed(0)} ms, compare ${timing.compareMs.toFixed(0)} ms; comparison of 4 on two threads: ${compTwo.toFixed(0)} ms`);
  if (cores < 2) console.log('   (this machine has one core: no speed-up possible)');
  else if (loadavg()[0] > cores - 0.5) {
    console.log(`   (load average ${loadavg()[0].toFixed(1)} on ${cores} cores: other processes hold the cores, so a second thread cannot show its speed-up now)`);
  }

  // 6. Memory.
  const perPair = bandBytes(prepared.pairs[0], 100000) + 8 * 100000;
  const market4 = 8 * prepared.maxYears * prepared.fundCount * BLOCK_PATHS;
  console.log(
    `\n6. memory per option × member path-year: ${(perPair / PATH_YEARS).toFixed(2)} B (per-age pots 4 B × (years − 1) and the terminal pot 8 B per path; engine 1.0.0: the same, ${((4 * 39 + 8) / 40).toFixed(2)} B), plus one market block of ${mib(market4)} per thread and the real pots kept for comparisons (8 B a path per pair)`,
  );
  const mem = process.memoryUsage();
  console.log(`   process now: heap used ${mib(mem.heapUsed)}, RSS ${mib(mem.rss)}, array buffers ${mib(mem.arrayBuffers)}`);
}

/** CPU milliseconds of the three phases (simulation/run.ts) of one single-thread run. */
function phaseTimes(input: ScenarioInput) {
  const prepared = prepareScenario(parseScenario(input));
  const cpu = (fn: () => void) => {
    const c0 = process.cpuUsage();
    fn();
    const c = process.cpuUsage(c0);
    return (c.user + c.system) / 1000;
  };
  const stores = createPairStores(prepared, prepared.pairs.map((p) => p.pairIndex));
  const simulate = cpu(() => simulateRange(prepared, 0, prepared.scenario.paths, stores));
  let summaries: ReturnType<typeof summarisePair>[] = [];
  const summarise = cpu(() => (summaries = stores.map((s) => summarisePair(prepared, s))));
  const compare = cpu(() =>
    prepared.scenario.members.forEach((_, member) =>
      runMemberComparison(
        prepared,
        member,
        summaries.map((s) => s.result),
        summaries.map((s) => s.curve),
      ),
    ),
  );
  return { simulate, summarise, compare };
}

void main();
