import pino, { type Logger } from 'pino';

/**
 * Structured JSON logs (one object a line) for the server and the worker. In development
 * they are printed readably through pino-pretty (a development dependency only); tests log
 * warnings and errors only unless KEELSON_LOG_LEVEL says otherwise.
 */
function makeLogger(): Logger {
  const env = process.env.NODE_ENV ?? 'development';
  const level = process.env.KEELSON_LOG_LEVEL ?? (env === 'test' || process.env.VITEST ? 'warn' : 'info');
  const base = { service: process.env.KEELSON_PROCESS ?? 'keelson' };
  if (env === 'development' && !process.env.VITEST && process.env.KEELSON_LOG_FORMAT !== 'json') {
    try {
      require.resolve('pino-pretty');
      return pino({ level, base, transport: { target: 'pino-pretty', options: { colorize: true, translateTime: 'HH:MM:ss', ignore: 'pid,hostname,service' } } });
    } catch {
      // pino-pretty is not installed (a production install): JSON it is.
    }
  }
  return pino({ level, base, timestamp: pino.stdTimeFunctions.isoTime });
}

export const log: Logger = makeLogger();

/** The message of an unknown thrown value. */
export const messageOf = (err: unknown) => (err instanceof Error ? err.message : String(err));
