import { loadConfig, type Config } from './config';
import { log, messageOf } from './log';

/** Loads the configuration or ends the process with the reasons (exit code 2). */
export function configOrExit(what: string): Config {
  try {
    return loadConfig();
  } catch (err) {
    process.stderr.write(`keelson: ${what} refused to start: ${messageOf(err)}\n`);
    process.exit(2);
  }
}

/** A process that rides out faults: a stray rejected promise is logged, not fatal. */
export function keepRunningOnRejections(): void {
  process.on('unhandledRejection', (reason) => log.error({ err: reason }, 'unhandled promise rejection'));
}

/**
 * Starts something that needs the database, trying again every few seconds while the
 * database is unreachable (a worker started before PostgreSQL, or during a restart).
 */
export async function startWhenReachable<T>(what: string, start: () => Promise<T>, isStopping: () => boolean, delayMs = 3000): Promise<T | null> {
  for (let attempt = 1; ; attempt++) {
    if (isStopping()) return null;
    try {
      return await start();
    } catch (err) {
      log.warn({ attempt, reason: messageOf(err) }, `${what} could not start yet; trying again`);
      await new Promise((r) => setTimeout(r, delayMs));
    }
  }
}

/** Calls `stop` once on SIGINT or SIGTERM, then exits; a second signal or 8 s exits at once. */
export function onStopSignal(what: string, stop: () => Promise<void>): void {
  let stopping = false;
  const handle = (signal: string) => {
    if (stopping) process.exit(1);
    stopping = true;
    log.info(`${signal} received, stopping the ${what}...`);
    setTimeout(() => process.exit(0), 8000).unref();
    stop()
      .catch((err) => log.warn({ err }, `${what} did not stop cleanly`))
      .finally(() => process.exit(0));
  };
  process.on('SIGINT', () => handle('SIGINT'));
  process.on('SIGTERM', () => handle('SIGTERM'));
}
