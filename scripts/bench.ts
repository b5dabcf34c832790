/**
 * Projection engine benchmark (prints figures; not a test).
 *
 *   npm run bench
 *
 * 1. One option × one member × 100,000 paths × 40 years × 3 funds on one thread: path loop
 *    alone, and the full run (summaries, bands, certainty equivalents).
 * 2. The same on every core (worker_threads).
 * 3. A comparison: 5 options × 3 members × 10,000 paths, full run on one thread.
 * 4. A straightforward reference implementation (plain objects, one path at a time, Box–Muller
 *    normals) in the same process, for a ratio.
 * Heap and RSS are printed after each step. Targets on a 2-core machine: ≥ 5 million
 * path-years/s on one thread, ≥ 1.8× that on two, the comparison under one second.
 */
import { availableParallelism } from 'node:os';

import { ComputePool, runScenarioThreaded } from '../server/compute/threads';
import {
  bandBytes,
  lognormalFromMoments,
  parseScenario,
  prepareScenario,
  runScenario,
  simulateRange,
  type ScenarioInput,
} from '../simulation';

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
const member = (id: string, age: number) => ({
  id,
  age,
  retirementAge: 65,
  salary: 32000,
  salaryGrowth: 0.03,
  contributionRate: 0.08,
  pot: 2000,
});
const common = { seed: 2024, inflation: 0.025, funds, correlations, riskAversion: 1.5, targetReplacementRatio: 0.3, annuity: { realRate: 0.01, years: 25 } };

const single: ScenarioInput = { ...common, paths: 100000, options: [option('lifestyle', 12)], members: [member('m40', 25)] };
const comparison: ScenarioInput = {
  ...common,
  paths: 10000,
  options: [option('o5', 5), option('o8', 8), option('o10', 10), option('o15', 15), option('o20', 20)],
  members: [member('age25', 25), member('age40', 40), member('age55', 55)],
};

const mib = (bytes: number) => `${(bytes / 1048576).toFixed(1)} MiB`;
function memory(label: string): void {
  const m = process.memoryUsage();
  console.log(`   memory after ${label}: heap used ${mib(m.heapUsed)}, RSS ${mib(m.rss)}, array buffers ${mib(m.arrayBuffers)}`);
}
function rate(pathYears: number, ms: number): string {
  return `${((pathYears / ms) * 1000 / 1e6).toFixed(2)} M path-years/s`;
}
function best(runs: number, fn: () => void): number {
  let min = Infinity;
  for (let k = 0; k < runs; k++) {
    const t0 = performance.now();
    fn();
    min = Math.min(min, performance.now() - t0);
  }
  return min;
}

/** Reference: plain objects and arrays, one path at a time, Box–Muller normals from a simple seeded generator. */
function referenceRun(paths: number): number {
  const years = 40;
  const params = funds.map((f) => lognormalFromMoments(f.expectedReturn, f.volatility));
  const chol = [
    [1, 0, 0],
    [0.7, Math.sqrt(1 - 0.49), 0],
    [0.1, 0, 0],
  ];
  chol[2][1] = (0.25 - 0.1 * 0.7) / chol[1][1];
  chol[2][2] = Math.sqrt(1 - chol[2][0] ** 2 - chol[2][1] ** 2);
  let state = 12345;
  const uniform = () => {
    state = (state * 1103515245 + 12345) % 2147483648;
    return (state + 0.5) / 2147483648;
  };
  const normal = () => Math.sqrt(-2 * Math.log(uniform())) * Math.cos(2 * Math.PI * uniform());
  const results: { pot: number; history: number[] }[] = [];
  for (let p = 0; p < paths; p++) {
    const path = { pot: 2000, history: [] as number[] };
    let salary = 32000;
    for (let y = 0; y < years; y++) {
      const toGo = years - y;
      const t = Math.min(toGo, 12) / 12;
      const weights = { eq: 0.8 * t, dg: 0.3 + (0.2 - 0.3) * t, bd: 0.7 * (1 - t) };
      const z = [normal(), normal(), normal()];
      const returns = funds.map((f, i) => {
        const x = chol[i].reduce((s, l, k) => s + l * z[k], 0);
        return { id: f.id, gross: Math.exp(params[i].mu + params[i].sigma * x), charge: f.annualCharge };
      });
      let growth = 0;
      let charge = 0;
      for (const r of returns) {
        const w = weights[r.id as keyof typeof weights];
        growth += w * r.gross;
        charge += w * r.charge;
      }
      if (y > 0) salary *= 1.03;
      path.pot = (path.pot + 0.08 * salary) * growth * (1 - charge);
      path.history.push(path.pot);
    }
    results.push(path);
  }
  return results.length;
}

async function main(): Promise<void> {
  const cores = availableParallelism();
  console.log(`Keelson projection benchmark — Node ${process.version}, ${cores} cores`);
  memory('start');

  // 1. One thread.
  const prepared = prepareScenario(parseScenario(single));
  const pathYears = 100000 * 40;
  simulateRange(prepared, 0, 20000, [0]); // warm up the JIT
  const loopMs = best(3, () => simulateRange(prepared, 0, 100000, [0]));
  console.log(`1. one thread, path loop: 1 option × 1 member × 100,000 paths × 40 years × 3 funds: ${loopMs.toFixed(0)} ms = ${rate(pathYears, loopMs)}`);
  const fullMs = best(2, () => runScenario(single));
  console.log(`   full run incl. bands, percentiles, CE: ${fullMs.toFixed(0)} ms = ${rate(pathYears, fullMs)}`);
  console.log(
    `   memory bound for this run: per-age storage ${mib(bandBytes(prepared.pairs[0], 100000))} (4 B × paths × (years − 1)), terminal pots ${mib(8 * 100000)} (8 B × paths) per option × member`,
  );
  memory('one thread');

  // 2. All cores, on a warm pool of workers.
  const pool = new ComputePool(cores);
  await runScenarioThreaded({ ...single, paths: 40000 }, { pool }); // start workers, warm the JIT
  let threadedMs = Infinity;
  let loopThreadedMs = Infinity;
  for (let k = 0; k < 3; k++) {
    const timing = { simulateMs: 0, summariseMs: 0 };
    const t0 = performance.now();
    await runScenarioThreaded(single, { pool, timing });
    threadedMs = Math.min(threadedMs, performance.now() - t0);
    loopThreadedMs = Math.min(loopThreadedMs, timing.simulateMs);
  }
  await pool.close();
  console.log(
    `2. ${cores} worker threads (warm pool), path loop incl. transfer of the arrays: ${loopThreadedMs.toFixed(0)} ms = ${rate(pathYears, loopThreadedMs)} (${(loopMs / loopThreadedMs).toFixed(2)}× one thread)`,
  );
  console.log(`   full run incl. summaries on the calling thread: ${threadedMs.toFixed(0)} ms = ${rate(pathYears, threadedMs)}`);
  memory('threads');

  // 3. Comparison.
  const comparisonPathYears = 10000 * 5 * (40 + 25 + 10);
  runScenario({ ...comparison, paths: 1000 });
  const compMs = best(3, () => runScenario(comparison));
  const compPrepared = prepareScenario(parseScenario(comparison));
  const compBands = compPrepared.pairs.reduce((s, p) => s + bandBytes(p, 10000), 0);
  console.log(
    `3. comparison 5 options × 3 members × 10,000 paths (one thread, full run with break-even λ for 30 option pairs): ${compMs.toFixed(0)} ms (${rate(comparisonPathYears, compMs)} of option-member path-years)`,
  );
  console.log(`   per-age storage ${mib(compBands)} for all 15 pairs in one batch (cap 256 MiB per batch), terminal pots ${mib(15 * 8 * 10000)}`);
  memory('comparison');

  // 4. Reference implementation.
  const refPaths = 20000;
  referenceRun(2000);
  const refMs = best(2, () => referenceRun(refPaths));
  const refRate = (refPaths * 40) / refMs;
  console.log(
    `4. reference (plain objects, one path at a time): ${refPaths} paths × 40 years: ${refMs.toFixed(0)} ms = ${rate(refPaths * 40, refMs)}; engine path loop is ${(pathYears / loopMs / refRate).toFixed(1)}× faster`,
  );
  memory('reference');
}

void main();
