import { afterEach, describe, expect, it, vi } from 'vitest';
import { fetchFile, fileNameFromDisposition } from './fetch-file';

describe('fileNameFromDisposition (RFC 6266)', () => {
  it('reads the quoted and the bare form', () => {
    expect(fileNameFromDisposition('attachment; filename="release-3-long.csv"')).toBe('release-3-long.csv');
    expect(fileNameFromDisposition('attachment; filename=release-3.json')).toBe('release-3.json');
  });

  it('prefers the UTF-8 form (RFC 5987) when both are sent', () => {
    expect(fileNameFromDisposition(`attachment; filename="W rme.csv"; filename*=UTF-8''W%C3%A4rme.csv`)).toBe('Wärme.csv');
  });

  it('gives null without a name', () => {
    expect(fileNameFromDisposition(null)).toBeNull();
    expect(fileNameFromDisposition('attachment')).toBeNull();
  });
});

describe('fetchFile', () => {
  afterEach(() => vi.unstubAllGlobals());

  it('reports the bytes as they arrive and keeps the server’s file name', async () => {
    const parts = [new TextEncoder().encode('a,b\n'), new TextEncoder().encode('1,-2\n')];
    const body = new ReadableStream<Uint8Array>({
      start(controller) {
        parts.forEach((p) => controller.enqueue(p));
        controller.close();
      },
    });
    vi.stubGlobal('fetch', vi.fn(async () => new Response(body, { headers: { 'Content-Disposition': 'attachment; filename="x.csv"', 'Content-Type': 'text/csv' } })));
    const seen: number[] = [];
    const file = await fetchFile('/releases/r/export', { format: 'csv-long' }, (n) => seen.push(n));
    expect(seen).toEqual([4, 9]);
    expect(file.fileName).toBe('x.csv');
    expect(await file.blob.text()).toBe('a,b\n1,-2\n');
  });

  it('refuses a download cut off mid-stream instead of saving half a file', async () => {
    const body = new ReadableStream<Uint8Array>({
      start(controller) {
        controller.enqueue(new TextEncoder().encode('a,b\n'));
        controller.error(new Error('socket hang up'));
      },
    });
    vi.stubGlobal('fetch', vi.fn(async () => new Response(body)));
    await expect(fetchFile('/releases/r/export', { format: 'csv-long' }, () => undefined)).rejects.toThrow('The download stopped before the end');
  });

  it('carries the server’s message of a refusal', async () => {
    vi.stubGlobal(
      'fetch',
      vi.fn(async () => new Response(JSON.stringify({ statusCode: 409, message: 'Release 2 is not published' }), { status: 409 })),
    );
    await expect(fetchFile('/releases/r/export', { format: 'json' })).rejects.toMatchObject({ status: 409, message: 'Release 2 is not published' });
  });
});
