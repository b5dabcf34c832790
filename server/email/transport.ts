import nodemailer from 'nodemailer';

export type SmtpSettings = { host: string; port: number; secure: boolean; user?: string; pass?: string; from: string };

export type OutgoingEnvelope = {
  to: string[];
  subject: string;
  text: string;
  /** Stable per outbox row: the same on every attempt. */
  messageId: string;
  /** 1 for the first attempt; sent as X-Keelson-Attempt so a repeat is visible in the headers too. */
  attempt: number;
  attachments: { filename: string; contentType: string; content: Buffer }[];
};

export type MailTransport = { send: (m: OutgoingEnvelope) => Promise<{ providerId: string }>; close: () => void };

/** nodemailer over SMTP to the configured server (or the local stand-in). */
export function smtpTransport(s: SmtpSettings): MailTransport {
  const t = nodemailer.createTransport({
    host: s.host,
    port: s.port,
    secure: s.secure,
    auth: s.user ? { user: s.user, pass: s.pass ?? '' } : undefined,
    connectionTimeout: 10_000,
    greetingTimeout: 10_000,
    socketTimeout: 30_000,
  });
  return {
    send: async (m) => {
      const info = await t.sendMail({
        from: s.from,
        to: m.to,
        subject: m.subject,
        text: m.text,
        messageId: m.messageId,
        headers: { 'X-Keelson-Attempt': String(m.attempt) },
        attachments: m.attachments,
      });
      if (info.rejected?.length) throw new Error(`the mail server refused ${info.rejected.map(String).join(', ')}`);
      return { providerId: String(info.response ?? info.messageId ?? '') };
    },
    close: () => t.close(),
  };
}
