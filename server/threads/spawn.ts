import path from 'node:path';
import { Worker } from 'node:worker_threads';

/**
 * Starts a worker thread on `entry` (a file name without extension beside this one). From the
 * TypeScript sources (development, tests) a one-line bootstrap registers tsx; from the
 * compiled build (production) the bundled `<entry>.js` beside the server bundle is loaded
 * directly (scripts/build-server.ts emits it there).
 */
export function spawnThread(entry: string, workerData?: unknown): Worker {
  if (__filename.endsWith('.ts')) {
    const file = path.join(__dirname, `${entry}.ts`);
    return new Worker(`require('tsx/cjs'); require(${JSON.stringify(file)});`, { eval: true, workerData });
  }
  return new Worker(path.join(__dirname, `${entry}.js`), { workerData });
}

/** Runs one job on a fresh thread and resolves with its single reply. */
export function runOnThread<T>(entry: string, input: unknown, transfer: ArrayBuffer[] = []): Promise<T> {
  return new Promise((resolve, reject) => {
    const w = spawnThread(entry);
    let settled = false;
    w.once('message', (reply: T) => {
      settled = true;
      resolve(reply);
      void w.terminate();
    });
    w.once('error', (err) => {
      settled = true;
      reject(err);
    });
    w.once('exit', (code) => {
      if (!settled) reject(new Error(`thread ${entry} exited with code ${code} before answering`));
    });
    w.postMessage(input, transfer);
  });
}
