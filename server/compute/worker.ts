import { parentPort } from 'node:worker_threads';

import type { CeCurve } from '../../simulation/breakEven';
import { prepareScenario, type PreparedScenario } from '../../simulation/prepare';
import { simulateRange, type PairStore } from '../../simulation/project';
import { runMemberComparison } from '../../simulation/run';
import type { Scenario } from '../../simulation/schema';
import { summarisePair } from '../../simulation/summary';
import type { ComputeJob, SharedStore, WorkerReply } from './protocol';

/**
 * Worker thread: simulates ranges of paths into shared memory, summarises pairs and compares
 * options — the engine's pure phases (simulation/run.ts) — so the calling thread only hands out
 * work and assembles.
 */
const port = parentPort;
if (!port) throw new Error('server/compute/worker.ts must run in a worker thread');

// The last scenario prepared: consecutive jobs of a run share it.
let cached: { scenario: Scenario; prepared: PreparedScenario } | null = null;
function prepared(scenario: Scenario): PreparedScenario {
  if (!cached || JSON.stringify(cached.scenario) !== JSON.stringify(scenario)) cached = { scenario, prepared: prepareScenario(scenario) };
  return cached.prepared;
}

const asStore = (s: SharedStore): PairStore => ({
  pairIndex: s.pairIndex,
  paths: s.paths,
  bands: s.bands ? new Float32Array(s.bands) : null,
  terminal: new Float64Array(s.terminal),
});

function send(reply: WorkerReply): void {
  port!.postMessage(reply);
}

port.on('message', (job: ComputeJob) => {
  try {
    const p = prepared(job.scenario);
    if (job.type === 'simulate') {
      let lastReported = 0;
      simulateRange(p, job.start, job.end, job.stores.map(asStore), {
        onProgress: (fraction) => {
          if (fraction - lastReported >= 0.05 || fraction === 1) {
            lastReported = fraction;
            send({ type: 'progress', jobId: job.jobId, fraction });
          }
        },
      });
      send({ type: 'simulated', jobId: job.jobId });
    } else if (job.type === 'summarise') {
      const summaries = job.stores.map((s) => summarisePair(p, asStore(s), { shared: true }));
      send({ type: 'summarised', jobId: job.jobId, summaries });
    } else {
      const results: { terminalRealPots: Float64Array; atRetirement: { targetRealPot: number } }[] = [];
      const curves: CeCurve[] = [];
      for (const [index, pair] of Object.entries(job.pairs)) {
        results[Number(index)] = { terminalRealPots: new Float64Array(pair.pots), atRetirement: { targetRealPot: pair.targetRealPot } };
        curves[Number(index)] = pair.curve;
      }
      const compared = job.members.map((m) => runMemberComparison(p, m, results, curves));
      send({ type: 'compared', jobId: job.jobId, compared });
    }
  } catch (error) {
    send({
      type: 'error',
      jobId: job.jobId,
      name: error instanceof Error ? error.name : 'Error',
      message: error instanceof Error ? error.message : String(error),
    });
  }
});
