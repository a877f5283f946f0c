import { randomUUID } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { MEDIA_LINK_EXPIRED, MEDIA_LINK_INVALID, MediaUrlSigner } from './media-url-signer';

const SECRET = 'a-long-enough-secret-value-for-tests';
const NOW = 1_800_000_000;

function parts(url: string) {
  const u = new URL(url, 'http://x');
  const [, , , id, kind] = u.pathname.split('/');
  return { id, kind, exp: u.searchParams.get('exp') ?? undefined, sig: u.searchParams.get('sig') ?? undefined };
}

describe('MediaUrlSigner', () => {
  const signer = new MediaUrlSigner(SECRET);
  const id = randomUUID();

  it('builds /api/media/<id>/<kind>?exp&sig links that verify until they expire', () => {
    const url = signer.url(id, 'proxy', NOW + 900);
    expect(url).toMatch(new RegExp(`^/api/media/${id}/proxy\\?exp=${NOW + 900}&sig=[A-Za-z0-9_-]{43}$`));
    const p = parts(url);
    expect(signer.verify(p.id, p.kind, p.exp, p.sig, NOW)).toEqual({ ok: true });
    expect(signer.verify(p.id, p.kind, p.exp, p.sig, NOW + 900)).toEqual({ ok: true });
  });

  it('says "expired" once exp has passed', () => {
    const p = parts(signer.url(id, 'original', NOW - 1));
    expect(signer.verify(p.id, p.kind, p.exp, p.sig, NOW)).toEqual({ ok: false, message: MEDIA_LINK_EXPIRED });
  });

  it('opens only the recording and kind it was made for', () => {
    const p = parts(signer.url(id, 'poster', NOW + 60));
    expect(signer.verify(randomUUID(), 'poster', p.exp, p.sig, NOW)).toEqual({ ok: false, message: MEDIA_LINK_INVALID });
    expect(signer.verify(id, 'original', p.exp, p.sig, NOW)).toEqual({ ok: false, message: MEDIA_LINK_INVALID });
    expect(signer.verify(id, 'proxy', p.exp, p.sig, NOW)).toEqual({ ok: false, message: MEDIA_LINK_INVALID });
  });

  it('rejects a longer expiry written into a link (tampering) as not valid, not as expired', () => {
    const p = parts(signer.url(id, 'proxy', NOW - 10));
    expect(signer.verify(id, 'proxy', String(NOW + 3600), p.sig, NOW)).toEqual({ ok: false, message: MEDIA_LINK_INVALID });
  });

  it('rejects every one-character change of the signature, including the spare bits of the last character', () => {
    const p = parts(signer.url(id, 'proxy', NOW + 60));
    const sig = p.sig as string;
    const alphabet = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789-_';
    for (const position of [0, 21, 42]) {
      for (const c of alphabet) {
        if (c === sig[position]) continue;
        const forged = sig.slice(0, position) + c + sig.slice(position + 1);
        expect(signer.verify(id, 'proxy', p.exp, forged, NOW).ok, `${position}:${c}`).toBe(false);
      }
    }
  });

  it('rejects links signed with another secret, and malformed parameters', () => {
    const other = new MediaUrlSigner('another-secret-of-enough-length');
    const p = parts(other.url(id, 'proxy', NOW + 60));
    expect(signer.verify(id, 'proxy', p.exp, p.sig, NOW).ok).toBe(false);
    const good = parts(signer.url(id, 'proxy', NOW + 60));
    const cases: Array<[string, unknown, unknown]> = [
      ['proxy', undefined, good.sig],
      ['proxy', good.exp, undefined],
      ['proxy', ['1', '2'], good.sig],
      ['proxy', '-5', good.sig],
      ['proxy', '0', good.sig],
      ['proxy', '1e12', good.sig],
      ['proxy', good.exp, `${good.sig}=`],
      ['proxy', good.exp, (good.sig as string).slice(1)],
      ['thumbnail', good.exp, good.sig],
      ['../original', good.exp, good.sig],
    ];
    for (const [kind, exp, sig] of cases) {
      expect(signer.verify(id, kind, exp, sig, NOW), JSON.stringify([kind, exp, sig])).toEqual({ ok: false, message: MEDIA_LINK_INVALID });
    }
  });

  it('needs the secret and a positive whole exp', () => {
    expect(() => new MediaUrlSigner('short')).toThrow(/JWT secret/);
    expect(() => signer.sign(id, 'proxy', 1.5)).toThrow(RangeError);
  });
});
