import http from 'node:http';
import { createDb } from '../db/client';
import { createApp } from './app';
import { loadConfig } from './config';
import { startMailAndExports } from './email/start';
import { startRunWorker, type RunWorker } from './jobs';

async function main() {
  let config;
  try {
    config = loadConfig();
  } catch (err) {
    console.error(`keelson: ${(err as Error).message}`);
    process.exit(2);
  }
  const { db, pool } = createDb(config.DATABASE_URL);
  const app = createApp({ db, pool, config });
  const server = http.createServer(app);
  // Mail delivery and statement exports (and the local stand-in mail server unless SMTP_HOST is set).
  const background = await startMailAndExports({ db, pool, config }).catch((err: Error) => {
    console.error(`keelson: mail and export workers failed to start: ${err.message}`);
    process.exit(1);
  });

  server.on('error', (err: NodeJS.ErrnoException) => {
    if (err.code === 'EADDRINUSE') {
      console.error(`keelson: port ${config.PORT} on ${config.HOST} is already in use. Stop the other program or start with PORT=<another port>.`);
    } else {
      console.error('keelson: server failed to start:', err.message);
    }
    process.exit(1);
  });

  server.listen(config.PORT, config.HOST, () => {
    const url = `http://${config.HOST === '0.0.0.0' ? 'localhost' : config.HOST}:${config.PORT}`;
    console.log(`keelson: serving ${url}  (API at ${url}/api, health at ${url}/api/health)`);
  });

  // A projection worker in this process unless KEELSON_INLINE_WORKER=false (then run `npm run worker`).
  let worker: RunWorker | null = null;
  if (process.env.KEELSON_INLINE_WORKER !== 'false') {
    startRunWorker({ db, pool })
      .then((w) => {
        worker = w;
        console.log('keelson: projection worker running in this process (KEELSON_INLINE_WORKER=false to turn it off)');
      })
      .catch((err) => console.error('keelson: projection worker failed to start:', err.message));
  }

  let stopping = false;
  const stop = (signal: string) => {
    if (stopping) return;
    stopping = true;
    console.log(`keelson: ${signal} received, stopping the server...`);
    server.close(() => {
      (worker ? worker.stop() : Promise.resolve())
        .catch(() => undefined)
        .then(() => background.stop())
        .catch(() => undefined)
        .then(() => pool.end())
        .finally(() => {
          console.log('keelson: server stopped (the database keeps running; `npm run db:stop` stops it)');
          process.exit(0);
        });
    });
    server.closeAllConnections?.();
    setTimeout(() => process.exit(0), 8000).unref();
  };
  process.on('SIGINT', () => stop('SIGINT'));
  process.on('SIGTERM', () => stop('SIGTERM'));
}

void main();
