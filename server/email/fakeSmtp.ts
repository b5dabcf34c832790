import { SMTPServer } from 'smtp-server';
import type { AddressInfo } from 'node:net';
import type { Db } from '../../db/client';
import { sql } from 'drizzle-orm';
import { receivedMail } from '../../db/schema';

/** The Message-ID header of a raw message (in its header block), or null. */
export function rawMessageId(raw: Buffer): string | null {
  const head = raw.subarray(0, Math.max(0, raw.indexOf('\r\n\r\n')) || raw.length).toString('utf8');
  const m = /^Message-ID:\s*(<[^>\r\n]+>)/im.exec(head);
  return m ? m[1] : null;
}

/**
 * A stand-in for a hosted mail service, for development and tests: an SMTP server on
 * loopback that accepts every message and keeps it, raw, in `received_mail`. It belongs to
 * the pretend outside world, not to Keelson, so its writes carry no audit event.
 * `setRejecting(reason)` makes it refuse messages (550) until cleared, to exercise retries.
 * Like mail services that de-duplicate, it keeps a message whose Message-ID it already holds
 * only once (and still accepts it, so the sender records it as sent).
 */
export type FakeSmtp = { host: string; port: number; close: () => Promise<void>; setRejecting: (reason: string | null) => void };

export async function startFakeSmtp(opts: { db: Db; port?: number; host?: string; log?: (m: string) => void }): Promise<FakeSmtp> {
  const host = opts.host ?? '127.0.0.1';
  let rejecting: string | null = null;
  const server = new SMTPServer({
    name: 'keelson-local-mail',
    banner: 'Keelson local stand-in mail server (keeps mail, delivers nothing)',
    authOptional: true,
    disabledCommands: ['STARTTLS', 'AUTH'],
    size: 25 * 1024 * 1024,
    logger: false,
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on('data', (c: Buffer) => chunks.push(c));
      stream.on('error', (e) => callback(e));
      stream.on('end', () => {
        if (rejecting) {
          const err = Object.assign(new Error(rejecting), { responseCode: 550 });
          callback(err);
          return;
        }
        const raw = Buffer.concat(chunks);
        const mid = rawMessageId(raw);
        const seen = mid
          ? opts.db
              .select({ id: receivedMail.id })
              .from(receivedMail)
              .where(sql`position(convert_to(${`Message-ID: ${mid}`}, 'UTF8') in ${receivedMail.raw}) > 0`)
              .limit(1)
          : Promise.resolve([]);
        seen
          .then((rows) => {
            if (rows.length) return [{ id: rows[0].id }];
            return opts.db
              .insert(receivedMail)
          .values({
            envelopeFrom: session.envelope.mailFrom ? session.envelope.mailFrom.address : null,
            envelopeTo: session.envelope.rcptTo.map((r) => r.address),
            raw,
          })
          .returning({ id: receivedMail.id });
          })
          .then(([row]) => callback(null, `kept as local message ${row.id}`))
          .catch((e: Error) => callback(Object.assign(new Error(`local mail store failed: ${e.message}`), { responseCode: 451 })));
      });
    },
  });
  server.on('error', (e) => opts.log?.(`local mail server error: ${e.message}`));
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(opts.port ?? 0, host, () => resolve());
  });
  const port = (server.server.address() as AddressInfo).port;
  return {
    host,
    port,
    setRejecting: (reason) => {
      rejecting = reason;
    },
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
