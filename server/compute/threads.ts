import { availableParallelism } from 'node:os';
import path from 'node:path';
import { Worker } from 'node:worker_threads';

import type { CeCurve } from '../../simulation/breakEven';
import { pairIndexOf, type ComparedPair } from '../../simulation/compare';
import { DEFAULT_BAND_BUDGET_BYTES, planBatches, prepareScenario, type PreparedScenario } from '../../simulation/prepare';
import { BLOCK_PATHS, createPairStores, type PairStore } from '../../simulation/project';
import { SIMULATE_SHARE } from '../../simulation/run';
import { parseScenario } from '../../simulation/schema';
import { assembleResult, type PairResult, type ProjectionResult } from '../../simulation/summary';
import type { ComputeJob, SharedStore, SummarisedPair, WorkerReply } from './protocol';

export interface ThreadedRunOptions {
  /** Worker threads to use (default: available parallelism). At least 1. */
  threads?: number;
  /** Called with the fraction of the run done (0 … 1). */
  onProgress?: (fractionDone: number) => void;
  /** Per-batch cap on per-age storage, as in runScenario. */
  bandBudgetBytes?: number;
  /** Reuse these workers (kept warm between runs) instead of starting and stopping new ones. */
  pool?: ComputePool;
  /** Filled with wall-clock milliseconds spent in each phase (all of it in the workers). */
  timing?: { simulateMs: number; summariseMs: number; compareMs?: number };
}

// Workers are TypeScript: a one-line CommonJS bootstrap registers tsx's require hook and loads
// worker.ts, which works the same whether the parent runs under tsx, vitest or plain node + tsx.
const WORKER_FILE = path.join(__dirname, 'worker.ts');
const BOOTSTRAP = `require('tsx/cjs'); require(${JSON.stringify(WORKER_FILE)});`;

/** Share of the progress bar for the batches; the comparisons take the rest. */
const BATCHES_SHARE = 0.9;

/**
 * Split [0, paths) into `parts` contiguous ranges, with boundaries on multiples of one block
 * of paths where possible (a range may start anywhere: every path's numbers depend only on
 * the seed and the path; alignment only keeps blocks full).
 */
export function splitPaths(paths: number, parts: number, antithetic = false): [number, number][] {
  const unit = BLOCK_PATHS * (antithetic ? 2 : 1);
  const units = Math.ceil(paths / unit);
  const n = Math.max(1, Math.min(parts, units));
  const ranges: [number, number][] = [];
  let start = 0;
  for (let k = 0; k < n; k++) {
    const end = k === n - 1 ? paths : Math.min(paths, Math.round((units * (k + 1)) / n) * unit);
    if (end > start) ranges.push([start, end]);
    start = end;
  }
  return ranges;
}

type Done = Exclude<WorkerReply, { type: 'progress' | 'error' }>;

class WorkerHandle {
  private readonly worker: Worker;
  private pending = new Map<number, { resolve: (r: Done) => void; reject: (e: Error) => void; progress: (f: number) => void }>();

  constructor() {
    this.worker = new Worker(BOOTSTRAP, { eval: true });
    this.worker.on('message', (reply: WorkerReply) => {
      const job = this.pending.get(reply.jobId);
      if (!job) return;
      if (reply.type === 'progress') job.progress(reply.fraction);
      else if (reply.type === 'error') {
        this.pending.delete(reply.jobId);
        job.reject(new Error(`simulation worker failed: ${reply.message}`));
      } else {
        this.pending.delete(reply.jobId);
        job.resolve(reply);
      }
    });
    this.worker.on('error', (error) => this.failAll(error));
    this.worker.on('exit', (code) => {
      if (this.pending.size > 0) this.failAll(new Error(`simulation worker exited with code ${code}`));
    });
  }

  run<T extends Done['type']>(job: ComputeJob, expect: T, progress: (f: number) => void = () => {}): Promise<Extract<Done, { type: T }>> {
    return new Promise((resolve, reject) => {
      this.pending.set(job.jobId, {
        resolve: (r) => (r.type === expect ? resolve(r as Extract<Done, { type: T }>) : reject(new Error(`simulation worker answered ${r.type} to ${job.type}`))),
        reject,
        progress,
      });
      this.worker.postMessage(job);
    });
  }

  private failAll(error: Error): void {
    for (const job of this.pending.values()) job.reject(error);
    this.pending.clear();
  }

  terminate(): Promise<number> {
    return this.worker.terminate();
  }
}

/**
 * A set of simulation workers that can serve many runs (the server keeps one; worker start-up
 * costs a few hundred milliseconds). Call close() when done.
 */
export class ComputePool {
  readonly size: number;
  private readonly workers: WorkerHandle[];

  constructor(threads: number = availableParallelism()) {
    this.size = Math.max(1, Math.floor(threads));
    this.workers = Array.from({ length: this.size }, () => new WorkerHandle());
  }

  /** @internal */
  worker(k: number): WorkerHandle {
    return this.workers[k];
  }

  async close(): Promise<void> {
    await Promise.all(this.workers.map((w) => w.terminate()));
  }
}

/** Items split into `parts` groups of about equal total weight (largest first, to the lightest group). */
export function balance<T>(items: T[], parts: number, weight: (item: T) => number): T[][] {
  const groups: T[][] = Array.from({ length: Math.max(1, parts) }, () => []);
  const loads = groups.map(() => 0);
  for (const item of [...items].sort((a, b) => weight(b) - weight(a))) {
    const k = loads.indexOf(Math.min(...loads));
    groups[k].push(item);
    loads[k] += weight(item);
  }
  return groups.filter((g) => g.length > 0);
}

const shareStore = (s: PairStore): SharedStore => ({
  pairIndex: s.pairIndex,
  paths: s.paths,
  bands: s.bands ? (s.bands.buffer as SharedArrayBuffer) : null,
  terminal: s.terminal.buffer as SharedArrayBuffer,
});

/**
 * Validate and run a scenario on `threads` worker threads (or on `pool`), in the engine's three
 * phases (simulation/run.ts), all computed in the workers:
 * 1. simulate — paths split into contiguous ranges, one per worker, written straight into
 *    shared memory (no copying back);
 * 2. summarise — the batch's pairs shared out among the workers (about equal work each);
 * 3. compare — every member × pair of options shared out likewise, reading the real pots
 *    from shared memory.
 * The calling thread only hands out work and assembles the result. Because every path depends
 * only on (seed, path index, scenario) and every summary on a whole pair, the result is
 * byte-identical to runScenario and to any other thread count. Memory as runScenario.
 *
 * Throws ScenarioValidationError for invalid input.
 */
export async function runScenarioThreaded(input: unknown, options: ThreadedRunOptions = {}): Promise<ProjectionResult> {
  const scenario = parseScenario(input);
  const prepared = prepareScenario(scenario);
  const batches = planBatches(prepared, options.bandBudgetBytes ?? DEFAULT_BAND_BUDGET_BYTES);
  const threads = options.pool ? options.pool.size : Math.max(1, Math.floor(options.threads ?? availableParallelism()));
  const ranges = splitPaths(scenario.paths, threads, scenario.antithetic);
  const pool = options.pool ?? new ComputePool(threads);
  const timing = options.timing ?? { simulateMs: 0, summariseMs: 0 };
  timing.simulateMs = 0;
  timing.summariseMs = 0;
  timing.compareMs = 0;
  const results: PairResult[] = new Array(prepared.pairs.length);
  const curves: CeCurve[] = new Array(prepared.pairs.length);
  let jobId = 0;
  const report = (fraction: number) => options.onProgress?.(Math.min(1, fraction));
  try {
    for (let b = 0; b < batches.length; b++) {
      const stores = createPairStores(prepared, batches[b], { shared: true });
      const done = ranges.map(() => 0);
      const batchProgress = (within: number) => report((BATCHES_SHARE * (b + within)) / batches.length);
      const t0 = performance.now();
      await Promise.all(
        ranges.map(([start, end], k) =>
          pool.worker(k).run({ type: 'simulate', jobId: jobId++, scenario, start, end, stores: stores.map(shareStore) }, 'simulated', (fraction) => {
            done[k] = fraction;
            let sum = 0;
            ranges.forEach(([s, e], r) => (sum += done[r] * (e - s)));
            batchProgress((SIMULATE_SHARE * sum) / scenario.paths);
          }),
        ),
      );
      const t1 = performance.now();
      timing.simulateMs += t1 - t0;
      const groups = balance(stores, pool.size, (s) => prepared.pairs[s.pairIndex].years);
      const replies = await Promise.all(
        groups.map((group, k) => pool.worker(k).run({ type: 'summarise', jobId: jobId++, scenario, stores: group.map(shareStore) }, 'summarised')),
      );
      replies.forEach((reply, k) =>
        (reply.summaries as SummarisedPair[]).forEach((s, i) => {
          results[groups[k][i].pairIndex] = s.result;
          curves[groups[k][i].pairIndex] = s.curve;
        }),
      );
      timing.summariseMs += performance.now() - t1;
      batchProgress(1);
    }
    const t2 = performance.now();
    const compared = await compareAll(prepared, pool, results, curves, () => jobId++);
    timing.compareMs = performance.now() - t2;
    report(1);
    return assembleResult(prepared, results, compared);
  } finally {
    if (!options.pool) await pool.close();
  }
}

/** Phase 3 on the workers: members shared out, each worker reading the pots it needs from shared memory. */
async function compareAll(prepared: PreparedScenario, pool: ComputePool, results: PairResult[], curves: CeCurve[], nextId: () => number): Promise<ComparedPair[]> {
  const { scenario } = prepared;
  if (scenario.options.length < 2) return [];
  const members = scenario.members.map((_, m) => m);
  const groups = balance(members, pool.size, () => 1);
  const perMember: ComparedPair[][] = new Array(members.length);
  await Promise.all(
    groups.map(async (group, k) => {
      const pairs: Record<number, { pots: SharedArrayBuffer; curve: CeCurve; targetRealPot: number }> = {};
      for (const m of group) {
        scenario.options.forEach((_, o) => {
          const i = pairIndexOf(prepared, o, m);
          pairs[i] = { pots: results[i].terminalRealPots.buffer as SharedArrayBuffer, curve: curves[i], targetRealPot: results[i].atRetirement.targetRealPot };
        });
      }
      const reply = await pool.worker(k).run({ type: 'compare', jobId: nextId(), scenario, members: group, pairs }, 'compared');
      reply.compared.forEach((c, i) => (perMember[group[i]] = c));
    }),
  );
  return perMember.flat();
}
