import http from 'node:http';
import { createDb } from '../db/client';
import { createApp } from './app';
import { log } from './log';
import { configOrExit, keepRunningOnRejections, onStopSignal, startWhenReachable } from './processes';
import { startWorkers, type Workers } from './workers';

/**
 * The API and web server. Projection runs, mail and exports run in the worker process
 * (`npm run worker`; `npm start` starts both) unless KEELSON_INLINE_WORKER=true.
 */
function main() {
  keepRunningOnRejections();
  const config = configOrExit('the server');
  const { db, pool } = createDb(config.DATABASE_URL, 10, (err) => log.warn({ reason: err.message }, 'database connection lost; requests answer 503 until it is back'));
  const ctx = { db, pool, config };
  const server = http.createServer(createApp(ctx));

  server.on('error', (err: NodeJS.ErrnoException) => {
    if (err.code === 'EADDRINUSE') log.fatal(`port ${config.PORT} on ${config.HOST} is already in use. Stop the other program or start with PORT=<another port>.`);
    else log.fatal({ err }, 'server failed to start');
    process.exit(1);
  });
  server.listen(config.PORT, config.HOST, () => {
    const url = `http://${config.HOST === '0.0.0.0' ? 'localhost' : config.HOST}:${config.PORT}`;
    log.info({ url, publicUrl: config.PUBLIC_URL }, `serving ${url} (API at ${url}/api, health at ${url}/api/health)`);
  });

  let stopping = false;
  let workers: Workers | null = null;
  if (process.env.KEELSON_INLINE_WORKER === 'true') {
    void startWhenReachable('the in-process workers', () => startWorkers(ctx), () => stopping).then((w) => {
      workers = w;
      if (w) log.info('workers run inside the server process (KEELSON_INLINE_WORKER=true)');
    });
  } else {
    log.info('projection runs, mail and exports are handled by the worker process (npm run worker; npm start starts it)');
  }

  onStopSignal('server', async () => {
    stopping = true;
    await new Promise<void>((resolve) => {
      server.close(() => resolve());
      server.closeAllConnections?.();
    });
    if (workers) await workers.stop();
    await pool.end().catch(() => undefined);
    log.info('server stopped (the database keeps running; `npm run db:stop` stops it)');
  });
}

main();
