import { createHash, createHmac } from 'node:crypto';

/**
 * One-use links. A link's token is an HMAC of its access_tokens row id under a key derived
 * from SESSION_SECRET: nothing secret is stored (the row keeps only the token's SHA-256, for
 * look-up), and the mail job — in whichever process — recomputes the token when it sends the
 * message, so stored mail never holds a live token. Changing SESSION_SECRET withdraws every
 * outstanding link.
 */
export type LinkSettings = { key: Buffer; publicUrl: string };

export function linkSettings(config: { SESSION_SECRET: string; PUBLIC_URL: string }): LinkSettings {
  return { key: createHmac('sha256', config.SESSION_SECRET).update('keelson one-use links v1').digest(), publicUrl: config.PUBLIC_URL.replace(/\/+$/, '') };
}

/** The token of the link whose access_tokens row has this id. */
export function tokenFor(links: LinkSettings, tokenId: string): string {
  return createHmac('sha256', links.key).update(tokenId).digest('base64url');
}

export const hashToken = (token: string) => createHash('sha256').update(token).digest('hex');

/** The address a person opens: always PUBLIC_URL, never the Host header of a request. */
export function linkUrl(links: LinkSettings, tokenId: string): string {
  return `${links.publicUrl}/link?token=${encodeURIComponent(tokenFor(links, tokenId))}`;
}

/** Stands for the link in stored mail; the mail job puts the real link in when it sends. */
export const LINK_PLACEHOLDER = '{{link}}';
/** How stored mail shows the link (to administrators reading the outbox). */
export const LINK_REDACTED = '[one-use link: sent to the recipient only, not kept by Keelson]';
