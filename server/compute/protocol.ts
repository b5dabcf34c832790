import type { PairChunk } from '../../simulation/project';
import type { Scenario } from '../../simulation/schema';

/** Main thread → worker: simulate paths [start, end) for these pairs. */
export interface RangeJob {
  type: 'range';
  jobId: number;
  scenario: Scenario;
  start: number;
  end: number;
  pairIndices: number[];
}

/** Worker → main thread. */
export type WorkerReply =
  | { type: 'progress'; jobId: number; fraction: number }
  | { type: 'done'; jobId: number; chunks: PairChunk[] }
  | { type: 'error'; jobId: number; message: string };
