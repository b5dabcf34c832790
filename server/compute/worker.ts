import { parentPort } from 'node:worker_threads';

import { prepareScenario } from '../../simulation/prepare';
import { simulateRange } from '../../simulation/project';
import type { RangeJob, WorkerReply } from './protocol';

/**
 * Worker thread: runs the pure path loop for a range of paths and sends the typed arrays
 * back (transferred, not copied).
 */
const port = parentPort;
if (!port) throw new Error('server/compute/worker.ts must run in a worker thread');

port.on('message', (job: RangeJob) => {
  try {
    const prepared = prepareScenario(job.scenario);
    let lastReported = 0;
    const chunks = simulateRange(prepared, job.start, job.end, job.pairIndices, {
      onProgress: (fraction) => {
        if (fraction - lastReported >= 0.05 || fraction === 1) {
          lastReported = fraction;
          const reply: WorkerReply = { type: 'progress', jobId: job.jobId, fraction };
          port.postMessage(reply);
        }
      },
    });
    const reply: WorkerReply = { type: 'done', jobId: job.jobId, chunks };
    const transfer = chunks.flatMap((c) => [c.bands.buffer, c.terminal.buffer]) as ArrayBuffer[];
    port.postMessage(reply, transfer);
  } catch (error) {
    const reply: WorkerReply = {
      type: 'error',
      jobId: job.jobId,
      message: error instanceof Error ? error.message : String(error),
    };
    port.postMessage(reply);
  }
});
