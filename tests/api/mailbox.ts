import { createDb } from '../../db/client';
import { linkSettings } from '../../server/auth/links';
import type { OutgoingEnvelope } from '../../server/email/transport';
import { startBackgroundWorkers, type BackgroundWorkers } from '../../server/jobs/backgroundWorkers';
import type { TestServer } from '../helpers/app';

/**
 * Mail delivery for a test server into an in-memory mailbox: what the recipients would find
 * in their inboxes, as the mail job sends it (links filled in).
 */
export async function startMailbox(s: TestServer) {
  process.env.KEELSON_QUEUE_POLL_SECONDS ??= '0.5';
  const delivered: OutgoingEnvelope[] = [];
  const workerDb = createDb(s.url, 3);
  const workers: BackgroundWorkers = await startBackgroundWorkers({
    db: workerDb.db,
    pool: workerDb.pool,
    transport: { send: async (m) => (delivered.push(m), { providerId: `test-${delivered.length}` }), close: () => {} },
    links: linkSettings(s.config),
    log: () => {},
  });
  /** Waits for a message to `to` whose subject matches, and returns it. */
  const waitFor = async (to: string, subject: RegExp, timeoutMs = 15_000) => {
    const until = Date.now() + timeoutMs;
    for (;;) {
      const m = delivered.find((x) => x.to.includes(to) && subject.test(x.subject));
      if (m) return m;
      if (Date.now() > until) throw new Error(`no mail to ${to} matching ${subject} (got: ${delivered.map((d) => `${d.to.join(',')}: ${d.subject}`).join('; ')})`);
      await new Promise((r) => setTimeout(r, 100));
    }
  };
  /** The one-use link token in a delivered message. */
  const tokenIn = (m: OutgoingEnvelope) => {
    const link = /https?:\/\/\S+\/link\?token=([A-Za-z0-9_-]+)/.exec(m.text);
    if (!link) throw new Error(`no link in: ${m.text}`);
    return { url: link[0], token: link[1] };
  };
  return {
    delivered,
    waitFor,
    tokenIn,
    stop: async () => {
      await workers.stop();
      await workerDb.pool.end();
    },
  };
}
