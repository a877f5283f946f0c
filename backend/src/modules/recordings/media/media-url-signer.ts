import { MEDIA_KINDS, type MediaKind } from '@dialsheet/common';
import { createHmac, timingSafeEqual } from 'node:crypto';

export const MEDIA_LINK_EXPIRED = 'This media link has expired';
export const MEDIA_LINK_INVALID = 'This media link is not valid';

export type MediaLinkCheck = { ok: true } | { ok: false; message: typeof MEDIA_LINK_EXPIRED | typeof MEDIA_LINK_INVALID };

/** A SHA-256 HMAC in base64url. */
const SIGNATURE_PATTERN = /^[A-Za-z0-9_-]{43}$/;
const EXP_PATTERN = /^\d{1,12}$/;

export function isMediaKind(value: string): value is MediaKind {
  return (MEDIA_KINDS as readonly string[]).includes(value);
}

/**
 * Short-lived links for media a `<video>` or `<img>` element loads (it cannot send a bearer
 * token). The signature covers the recording, the kind of file and the expiry, so a link opens
 * exactly one file of one recording until it expires. The key is derived from the JWT secret
 * with a fixed label, so a media signature can never be mistaken for anything else signed with it.
 */
export class MediaUrlSigner {
  private readonly key: Buffer;

  constructor(jwtSecret: string) {
    if (typeof jwtSecret !== 'string' || jwtSecret.length < 16) throw new Error('the media link key needs the JWT secret');
    this.key = createHmac('sha256', jwtSecret).update('dialsheet media links v1').digest();
  }

  sign(recordingId: string, kind: MediaKind, exp: number): string {
    if (!Number.isInteger(exp) || exp <= 0) throw new RangeError('exp must be a whole number of seconds since 1970');
    return createHmac('sha256', this.key).update(`${recordingId.toLowerCase()}\n${kind}\n${exp}`).digest('base64url');
  }

  /** `/api/media/<id>/<kind>?exp=…&sig=…` */
  url(recordingId: string, kind: MediaKind, exp: number): string {
    const sig = this.sign(recordingId, kind, exp);
    return `/api/media/${recordingId.toLowerCase()}/${kind}?exp=${exp}&sig=${sig}`;
  }

  /**
   * The signature is checked before the expiry, so a forged link is "not valid" whatever its
   * exp says, and "expired" is only ever said of a link we issued.
   */
  verify(recordingId: string, kind: string, exp: unknown, sig: unknown, nowSeconds: number = Math.floor(Date.now() / 1000)): MediaLinkCheck {
    const invalid = { ok: false, message: MEDIA_LINK_INVALID } as const;
    if (!isMediaKind(kind) || typeof exp !== 'string' || typeof sig !== 'string') return invalid;
    if (!EXP_PATTERN.test(exp) || Number(exp) <= 0 || !SIGNATURE_PATTERN.test(sig)) return invalid;
    // Compared as text: base64url leaves two spare bits in the last character, so comparing
    // decoded bytes would accept more than one spelling of the same signature.
    const expected = Buffer.from(this.sign(recordingId, kind, Number(exp)), 'utf8');
    const given = Buffer.from(sig, 'utf8');
    if (given.length !== expected.length || !timingSafeEqual(given, expected)) return invalid;
    if (Number(exp) < nowSeconds) return { ok: false, message: MEDIA_LINK_EXPIRED };
    return { ok: true };
  }
}
