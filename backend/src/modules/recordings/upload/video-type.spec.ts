import { UnsupportedMediaTypeException } from '@nestjs/common';
import { describe, expect, it } from 'vitest';
import { detectVideoType, looksLikeText, requireVideo } from './video-type';

/** An ISO BMFF file starts with an ftyp box naming its brand. */
function ftyp(brand: string, compatible: string[] = []): Buffer {
  const body = Buffer.concat([Buffer.from(brand, 'latin1'), Buffer.from([0, 0, 2, 0]), ...compatible.map((c) => Buffer.from(c, 'latin1'))]);
  const size = Buffer.alloc(4);
  size.writeUInt32BE(8 + body.length);
  return Buffer.concat([size, Buffer.from('ftyp', 'latin1'), body, Buffer.alloc(64)]);
}

/** EBML header with a DocType element (Matroska / WebM). */
function ebml(docType: string): Buffer {
  const doc = Buffer.concat([Buffer.from([0x42, 0x82, 0x80 | docType.length]), Buffer.from(docType, 'latin1')]);
  return Buffer.concat([Buffer.from([0x1a, 0x45, 0xdf, 0xa3, 0x80 | doc.length]), doc, Buffer.alloc(64)]);
}

function riff(form: string): Buffer {
  return Buffer.concat([Buffer.from('RIFF', 'latin1'), Buffer.from([0, 0x10, 0, 0]), Buffer.from(form, 'latin1'), Buffer.from('LIST', 'latin1'), Buffer.alloc(64)]);
}

describe('detectVideoType', () => {
  it.each([
    ['MP4', ftyp('isom', ['isom', 'iso2', 'avc1', 'mp41']), 'video/mp4'],
    ['QuickTime', ftyp('qt  ', ['qt  ']), 'video/quicktime'],
    ['M4V', ftyp('M4V ', ['M4V ', 'M4A ', 'mp42']), 'video/x-m4v'],
    ['WebM', ebml('webm'), 'video/webm'],
    ['Matroska', ebml('matroska'), 'video/matroska'],
    ['AVI', riff('AVI '), 'video/vnd.avi'],
  ])('accepts %s from its first bytes', async (_label, head, mime) => {
    expect(await detectVideoType(head)).toEqual({ mime, isVideo: true });
    expect(await requireVideo(head)).toBe(mime);
  });

  it('calls a renamed text file text/plain and refuses it with that word', async () => {
    const head = Buffer.from('time,T1,T2\n0,21.5,18.0\n1,21.6,18.1\nTemperatur °C\n', 'utf8');
    expect(await detectVideoType(head)).toEqual({ mime: 'text/plain', isVideo: false });
    await expect(requireVideo(head)).rejects.toThrow(new UnsupportedMediaTypeException('This file is not a video (found: text/plain)'));
  });

  it('names other known types and says "unknown type" for unknown bytes', async () => {
    const png = Buffer.concat([Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13]), Buffer.from('IHDR'), Buffer.alloc(64)]);
    await expect(requireVideo(png)).rejects.toThrow('This file is not a video (found: image/png)');
    const audioOnly = ftyp('M4A ', ['M4A ', 'mp42', 'isom']);
    await expect(requireVideo(audioOnly)).rejects.toThrow('This file is not a video (found: audio/x-m4a)');
    const noise = Buffer.from(Array.from({ length: 512 }, (_, i) => (i * 73 + 11) % 256));
    await expect(requireVideo(noise)).rejects.toThrow('This file is not a video (found: unknown type)');
  });
});

describe('looksLikeText', () => {
  it('accepts UTF-8 text even when the sample cuts a character in half', () => {
    const text = Buffer.from('Druck 101,3 kPa — Ölkühler ✓', 'utf8');
    expect(looksLikeText(text)).toBe(true);
    expect(looksLikeText(text.subarray(0, text.length - 1))).toBe(true);
  });

  it('refuses binary and empty samples', () => {
    expect(looksLikeText(Buffer.from([0x48, 0x00, 0x49]))).toBe(false);
    expect(looksLikeText(Buffer.from([0xff, 0xfe, 0x41]))).toBe(false);
    expect(looksLikeText(Buffer.alloc(0))).toBe(false);
  });
});
