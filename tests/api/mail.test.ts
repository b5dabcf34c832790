import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { auditEvents, outboxMessages, receivedMail } from '../../db/schema';
import { startFakeSmtp, type FakeSmtp } from '../../server/email/fakeSmtp';
import { smtpTransport, type MailTransport } from '../../server/email/transport';
import { startBackgroundWorkers, type BackgroundWorkers } from '../../server/jobs/backgroundWorkers';
import { linkSettings, LINK_PLACEHOLDER, LINK_REDACTED } from '../../server/auth/links';
import { createDb } from '../../db/client';
import { Client, startTestServer, type TestServer } from '../helpers/app';
import { insertFinishedRun } from './route-examples/reports';
import { download, eventually } from './reports-helpers';

// Quick polling, two retries after the first attempt, one second apart (doubling).
process.env.KEELSON_QUEUE_POLL_SECONDS = '0.5';
process.env.KEELSON_MAIL_RETRY_LIMIT = '2';
process.env.KEELSON_MAIL_RETRY_DELAY_SECONDS = '1';

let s: TestServer;
let fake: FakeSmtp;
let workers: BackgroundWorkers;
let workerDb: ReturnType<typeof createDb>;
let trustee: Client;
let admin: Client;
/** The workers' transport; tests point it at the stand-in server or at a closed port. */
let current: MailTransport;
let toFake: MailTransport;

const S = () => `/schemes/${s.schemeId}`;

/** The decoded body of the MIME part whose filename is `name` (base64 transfer encoding, as nodemailer writes PDFs). */
function attachmentFromRaw(raw: string, name: string): Buffer | null {
  const at = raw.indexOf(`filename=${name}`) >= 0 ? raw.indexOf(`filename=${name}`) : raw.indexOf(`filename="${name}"`);
  if (at < 0) return null;
  const start = raw.indexOf('\r\n\r\n', at) + 4;
  const end = raw.indexOf('\r\n--', start);
  return Buffer.from(raw.slice(start, end).replace(/\s+/g, ''), 'base64');
}

async function message(id: string) {
  const [m] = await s.db.select().from(outboxMessages).where(eq(outboxMessages.id, id));
  return m;
}

beforeAll(async () => {
  s = await startTestServer();
  workerDb = createDb(s.url, 4);
  fake = await startFakeSmtp({ db: workerDb.db });
  toFake = smtpTransport({ host: fake.host, port: fake.port, secure: false, from: 'Keelson <no-reply@keelson.test>' });
  current = toFake;
  workers = await startBackgroundWorkers({ db: workerDb.db, pool: workerDb.pool, transport: { send: (m) => current.send(m), close: () => toFake.close() }, links: linkSettings(s.config), log: () => {} });
  trustee = new Client(s.baseUrl);
  await trustee.signIn('trustee@fernleigh.example');
  admin = new Client(s.baseUrl);
  await admin.signIn('admin@fernleigh.example');
});

afterAll(async () => {
  await workers?.stop();
  await fake?.close();
  await workerDb?.pool.end();
  await s?.close();
});

async function makeReport() {
  const { run } = await insertFinishedRun(s.db, s.schemeId, { paths: 200 });
  const r = await trustee.post(`${S()}/reports`, { runId: run.id, title: 'Quarterly default review' });
  expect(r.status).toBe(201);
  return r.body.id as string;
}

describe('e-mail through the outbox', () => {
  it("delivers a board report to the scheme's board reviewers with its PDF attached", async () => {
    const reportId = await makeReport();
    const sent = await trustee.post(`${S()}/reports/${reportId}/email`);
    expect(sent.status, JSON.stringify(sent.body)).toBe(202);
    expect(sent.body.recipients).toEqual(['board@fernleigh.example']);
    const m = await eventually('the message to be sent', async () => {
      const x = await message(sent.body.messageId);
      return x.status === 'sent' ? x : null;
    });
    expect(m.attempts).toBe(1);
    const got = await s.db.select().from(receivedMail);
    const mine = got.filter((g) => g.raw.toString('utf8').includes('Quarterly default review'));
    expect(mine).toHaveLength(1);
    expect(mine[0].envelopeTo).toEqual(['board@fernleigh.example']);
    const raw = mine[0].raw.toString('utf8');
    expect(raw).toMatch(/^Subject: Board report: Quarterly default review/m);
    const pdf = await download(trustee, `${S()}/reports/${reportId}/pdf`);
    expect(attachmentFromRaw(raw, 'quarterly-default-review.pdf')?.equals(pdf.body)).toBe(true);

    // The administrator's outbox lists it, with the attachment, which downloads intact.
    const box = await admin.get(`${S()}/outbox`);
    expect(box.status).toBe(200);
    const row = box.body.messages.find((x: { id: string }) => x.id === sent.body.messageId);
    expect(row).toMatchObject({ status: 'sent', kind: 'board-report', recipients: ['board@fernleigh.example'], attempts: 1 });
    expect(row.attachments).toEqual([expect.objectContaining({ filename: 'quarterly-default-review.pdf', contentType: 'application/pdf', size: pdf.body.length })]);
    const actions = (await s.db.select().from(auditEvents).where(eq(auditEvents.entityId, sent.body.messageId))).map((e) => e.action).sort();
    expect(actions).toEqual(['mail.queued', 'mail.sent']);
  });

  it('reports a refused send, retries it, and delivers it once the server accepts again', async () => {
    fake.setRejecting('Mailbox temporarily unavailable (test)');
    const reportId = await makeReport();
    const sent = await trustee.post(`${S()}/reports/${reportId}/email`);
    expect(sent.status).toBe(202);
    const retrying = await eventually('the failure to be recorded', async () => {
      const x = await message(sent.body.messageId);
      return x.status === 'retrying' ? x : null;
    });
    expect(retrying.attempts).toBeGreaterThanOrEqual(1);
    expect(retrying.lastError).toContain('Mailbox temporarily unavailable (test)');
    const box = await admin.get(`${S()}/outbox`);
    expect(box.body.messages.find((x: { id: string }) => x.id === sent.body.messageId)).toMatchObject({ status: 'retrying', lastError: expect.stringContaining('Mailbox temporarily unavailable') });
    fake.setRejecting(null);
    const done = await eventually('the retry to succeed', async () => {
      const x = await message(sent.body.messageId);
      return x.status === 'sent' ? x : null;
    });
    expect(done.attempts).toBeGreaterThanOrEqual(2);
    expect(done.lastError).toBeNull();
    const actions = (await s.db.select().from(auditEvents).where(eq(auditEvents.entityId, sent.body.messageId))).map((e) => e.action);
    expect(actions).toContain('mail.retrying');
    expect(actions).toContain('mail.sent');
  });

  it('marks a message failed, with the reason, when the server stays down through every retry; an administrator can send it again', async () => {
    // A port nothing listens on: the stand-in server is "down".
    const down = await startFakeSmtp({ db: workerDb.db });
    const downPort = down.port;
    await down.close();
    current = smtpTransport({ host: '127.0.0.1', port: downPort, secure: false, from: 'Keelson <no-reply@keelson.test>' });
    try {
      const reportId = await makeReport();
      const sent = await trustee.post(`${S()}/reports/${reportId}/email`);
      const failed = await eventually(
        'the message to fail for good',
        async () => {
          const x = await message(sent.body.messageId);
          return x.status === 'failed' ? x : null;
        },
        40_000,
      );
      // First attempt plus KEELSON_MAIL_RETRY_LIMIT retries.
      expect(failed.attempts).toBe(3);
      expect(failed.lastError).toMatch(/ECONNREFUSED|connect/i);
      current = toFake;
      expect((await admin.post(`${S()}/outbox/${sent.body.messageId}/retry`)).status).toBe(202);
      const again = await eventually('the manual retry to be sent', async () => {
        const x = await message(sent.body.messageId);
        return x.status === 'sent' ? x : null;
      });
      expect(again.attempts).toBe(4);
      // Only a failed message can be sent again.
      const twice = await admin.post(`${S()}/outbox/${sent.body.messageId}/retry`);
      expect(twice.status).toBe(409);
    } finally {
      current = toFake;
    }
  }, 60_000);

  it('sends invitations through the same path, the link filled in only in the delivered mail', async () => {
    const r = await admin.post(`${S()}/invitations`, { email: 'new.trustee@example.org', role: 'trustee' });
    expect(r.status).toBe(201);
    expect(r.body.link).toBeUndefined();
    const m = await eventually('the invitation to be delivered', async () => {
      const rows = await s.db.select().from(outboxMessages);
      return rows.find((x) => x.recipients.includes('new.trustee@example.org') && x.status === 'sent') ?? null;
    });
    expect(m.body).toContain(LINK_PLACEHOLDER);
    const got = await s.db.select().from(receivedMail);
    const raw = got.find((g) => g.envelopeTo.includes('new.trustee@example.org'))!.raw.toString('utf8');
    expect(raw).toMatch(new RegExp(`${s.config.PUBLIC_URL.replace(/[.:/]/g, '\\$&')}/link\\?token=[A-Za-z0-9_-]{40,}`));
    expect(raw).toMatch(new RegExp(`^Message-ID: <${m.id}@`, 'm'));
    // The scheme's administrator sees it in the outbox, without the link.
    const box = await admin.get(`${S()}/outbox`);
    const shown = box.body.messages.find((x: { id: string }) => x.id === m.id);
    expect(shown.body).toContain(LINK_REDACTED);
  });

  it('keeps a message sent once when the worker dies after the mail server accepted it: the retry carries the same Message-ID and the server drops the repeat', async () => {
    let crashOnce = true;
    current = {
      send: async (env) => {
        const out = await toFake.send(env);
        if (crashOnce) {
          crashOnce = false;
          // As if the process died here: accepted by the server, not yet recorded as sent.
          throw new Error('worker lost after the server accepted the message (simulated)');
        }
        return out;
      },
      close: () => {},
    };
    try {
      const reportId = await makeReport();
      const sent = await trustee.post(`${S()}/reports/${reportId}/email`);
      const done = await eventually('the retry to be recorded as sent', async () => {
        const x = await message(sent.body.messageId);
        return x.status === 'sent' ? x : null;
      });
      expect(done.attempts).toBe(2);
      const copies = (await s.db.select().from(receivedMail)).filter((g) => g.raw.toString('utf8').includes(`Message-ID: <${done.id}@`));
      expect(copies).toHaveLength(1);
    } finally {
      current = toFake;
    }
  });

  it("does not give the administrator a board report's PDF through the outbox, as the report route would not", async () => {
    const reportId = await makeReport();
    const sent = await trustee.post(`${S()}/reports/${reportId}/email`);
    await eventually('the report mail to be listed', async () => (await message(sent.body.messageId)) ?? null);
    const box = await admin.get(`${S()}/outbox`);
    const row = box.body.messages.find((x: { id: string }) => x.id === sent.body.messageId);
    expect(row.attachments).toEqual([expect.objectContaining({ filename: expect.stringMatching(/\.pdf$/) })]);
    expect((await download(admin, `${S()}/reports/${reportId}/pdf`)).status).toBe(403);
    expect((await download(admin, `${S()}/outbox/${row.id}/attachments/${row.attachments[0].id}`)).status).toBe(404);
  });

  it('refuses the outbox to anyone but the administrator, and a bad message id with 400', async () => {
    expect((await trustee.get(`${S()}/outbox`)).status).toBe(403);
    const bad = await admin.post(`${S()}/outbox/not-an-id/retry`);
    expect(bad.status).toBe(400);
  });
});
