import type { ComparedPair } from '../../simulation/compare';
import type { CeCurve } from '../../simulation/breakEven';
import type { Scenario } from '../../simulation/schema';
import type { PairResult } from '../../simulation/summary';

/** A pair's output arrays in shared memory (see simulation/project.ts, PairStore). */
export interface SharedStore {
  pairIndex: number;
  paths: number;
  bands: SharedArrayBuffer | null;
  terminal: SharedArrayBuffer;
}

/** Main thread → worker. Every job names the validated scenario it belongs to. */
export type ComputeJob =
  /** Simulate paths [start, end) of these pairs, writing into the shared stores. */
  | { type: 'simulate'; jobId: number; scenario: Scenario; start: number; end: number; stores: SharedStore[] }
  /** Summarise these pairs (all paths simulated); real pots come back in shared memory. */
  | { type: 'summarise'; jobId: number; scenario: Scenario; stores: SharedStore[] }
  /** Break-even λs and comparisons for these members, from their pairs' real pots and curves. */
  | {
      type: 'compare';
      jobId: number;
      scenario: Scenario;
      members: number[];
      /** Per pair index (every option of those members): real pots (shared), CE curve and target real pot. */
      pairs: Record<number, { pots: SharedArrayBuffer; curve: CeCurve; targetRealPot: number }>;
    };

/** A summarised pair as sent back: the result with its real pots in shared memory. */
export type SummarisedPair = { result: Omit<PairResult, 'terminalRealPots'> & { terminalRealPots: Float64Array }; curve: CeCurve };

/** Worker → main thread. */
export type WorkerReply =
  | { type: 'progress'; jobId: number; fraction: number }
  | { type: 'simulated'; jobId: number }
  | { type: 'summarised'; jobId: number; summaries: SummarisedPair[] }
  | { type: 'compared'; jobId: number; compared: ComparedPair[][] }
  | { type: 'error'; jobId: number; message: string; name: string };
