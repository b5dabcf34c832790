import { availableParallelism } from 'node:os';
import path from 'node:path';
import { Worker } from 'node:worker_threads';

import { DEFAULT_BAND_BUDGET_BYTES, planBatches, prepareScenario } from '../../simulation/prepare';
import type { PairChunk } from '../../simulation/project';
import { PATHS_PER_STREAM } from '../../simulation/random';
import { parseScenario } from '../../simulation/schema';
import { assembleResult, summarisePair, type PairResult, type ProjectionResult } from '../../simulation/summary';
import type { RangeJob, WorkerReply } from './protocol';

export interface ThreadedRunOptions {
  /** Worker threads to use (default: available parallelism). At least 1. */
  threads?: number;
  /** Called with the fraction of the run done (0 … 1). */
  onProgress?: (fractionDone: number) => void;
  /** Per-batch cap on per-age storage, as in runScenario. */
  bandBudgetBytes?: number;
  /** Reuse these workers (kept warm between runs) instead of starting and stopping new ones. */
  pool?: ComputePool;
  /** Filled with wall-clock milliseconds spent waiting for the workers and summarising. */
  timing?: { simulateMs: number; summariseMs: number };
}

// Workers are TypeScript: a one-line CommonJS bootstrap registers tsx's require hook and loads
// worker.ts, which works the same whether the parent runs under tsx, vitest or plain node + tsx.
const WORKER_FILE = path.join(__dirname, 'worker.ts');
const BOOTSTRAP = `require('tsx/cjs'); require(${JSON.stringify(WORKER_FILE)});`;

/**
 * Split [0, paths) into `parts` contiguous ranges, with boundaries on multiples of one
 * stream's worth of paths where possible (a range may start anywhere; alignment only avoids
 * skipping ahead in a stream).
 */
export function splitPaths(paths: number, parts: number, antithetic = false): [number, number][] {
  const unit = PATHS_PER_STREAM * (antithetic ? 2 : 1);
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

class WorkerHandle {
  private readonly worker: Worker;
  private pending = new Map<number, { resolve: (c: PairChunk[]) => void; reject: (e: Error) => void; progress: (f: number) => void }>();

  constructor() {
    this.worker = new Worker(BOOTSTRAP, { eval: true });
    this.worker.on('message', (reply: WorkerReply) => {
      const job = this.pending.get(reply.jobId);
      if (!job) return;
      if (reply.type === 'progress') job.progress(reply.fraction);
      else if (reply.type === 'done') {
        this.pending.delete(reply.jobId);
        job.resolve(reply.chunks);
      } else {
        this.pending.delete(reply.jobId);
        job.reject(new Error(`simulation worker failed: ${reply.message}`));
      }
    });
    this.worker.on('error', (error) => this.failAll(error));
    this.worker.on('exit', (code) => {
      if (this.pending.size > 0) this.failAll(new Error(`simulation worker exited with code ${code}`));
    });
  }

  run(job: RangeJob, progress: (f: number) => void): Promise<PairChunk[]> {
    return new Promise((resolve, reject) => {
      this.pending.set(job.jobId, { resolve, reject, progress });
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

/**
 * Validate and run a scenario on `threads` worker threads (or on `pool`). Paths are split into contiguous
 * ranges, one per thread; each worker runs the pure path loop and transfers its typed arrays
 * back; the main thread puts the chunks in path order and summarises. Because every path
 * depends only on (seed, path index, scenario), the result is byte-identical to runScenario
 * and to any other thread count. Memory as runScenario (the batches are the same); the
 * summaries run on the calling thread.
 *
 * Throws ScenarioValidationError for invalid input.
 */
export async function runScenarioThreaded(input: unknown, options: ThreadedRunOptions = {}): Promise<ProjectionResult> {
  const scenario = parseScenario(input);
  const prepared = prepareScenario(scenario);
  const batches = planBatches(prepared, options.bandBudgetBytes ?? DEFAULT_BAND_BUDGET_BYTES);
  const threads = options.pool ? options.pool.size : Math.max(1, Math.floor(options.threads ?? availableParallelism()));
  const ranges = splitPaths(scenario.paths, threads, scenario.antithetic);
  const pool = options.pool ?? new ComputePool(ranges.length);
  const workers = ranges.map((_, k) => pool.worker(k));
  const timing = options.timing ?? { simulateMs: 0, summariseMs: 0 };
  timing.simulateMs = 0;
  timing.summariseMs = 0;
  const results: PairResult[] = new Array(prepared.pairs.length);
  let jobId = 0;
  try {
    for (let b = 0; b < batches.length; b++) {
      const batch = batches[b];
      const done = ranges.map(() => 0);
      const report = () => {
        if (!options.onProgress) return;
        let sum = 0;
        ranges.forEach(([s, e], k) => (sum += done[k] * (e - s)));
        options.onProgress((b + sum / scenario.paths) / batches.length);
      };
      const t0 = performance.now();
      const chunkLists = await Promise.all(
        ranges.map(([start, end], k) =>
          workers[k].run(
            { type: 'range', jobId: jobId++, scenario, start, end, pairIndices: batch },
            (fraction) => {
              done[k] = fraction;
              report();
            },
          ),
        ),
      );
      const t1 = performance.now();
      timing.simulateMs += t1 - t0;
      const chunks = chunkLists.flat();
      for (const pairIndex of batch) {
        results[pairIndex] = summarisePair(
          prepared,
          pairIndex,
          chunks.filter((c) => c.pairIndex === pairIndex),
        );
        // Summaries run on this thread (sorting ~0.4 s per pair at 100,000 paths × 40 years):
        // give the event loop a turn between pairs so a server hosting the worker keeps answering.
        await new Promise<void>((resolve) => setImmediate(resolve));
      }
      timing.summariseMs += performance.now() - t1;
    }
  } finally {
    if (!options.pool) await pool.close();
  }
  return assembleResult(prepared, results);
}
