import { parentPort } from 'node:worker_threads';

import { compareTask, pairIndexOf } from '../../simulation/compare';
import { prepareScenario, type PreparedScenario } from '../../simulation/prepare';
import { simulateRange, type PairStore } from '../../simulation/project';
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
      const compared = job.tasks.map((task) => {
        const a = job.pairs[pairIndexOf(p, task.optionA, task.memberIndex)];
        const b = job.pairs[pairIndexOf(p, task.optionB, task.memberIndex)];
        return compareTask(p, task, new Float64Array(a.pots), new Float64Array(b.pots), a.curve, b.curve, a.targetRealPot);
      });
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
