// Serving one stored file over HTTP with byte ranges, for either storage driver: what a <video>
// element needs to seek (RFC 9110 §14 ranges, §13 conditional requests). Multipart byte ranges
// are not offered; a request for several ranges gets the whole file, as the RFC allows.
import type { Request, Response } from 'express';
import { STATUS_CODES } from 'node:http';
import { pipeline } from 'node:stream/promises';
import parseRange from 'range-parser';
import type { StorageService } from '../../../storage/storage.service';

export interface ServedObject {
  key: string;
  size: number;
  contentType: string;
  /** Strong entity tag, quoted. */
  etag: string;
  lastModified?: Date;
}

export type RangePlan =
  | { status: 200; start: number; end: number }
  | { status: 206; start: number; end: number }
  | { status: 304 }
  | { status: 416 };

export interface ConditionalHeaders {
  range?: string;
  ifRange?: string;
  ifNoneMatch?: string;
}

function etagMatches(list: string, etag: string): boolean {
  if (list.trim() === '*') return true;
  const bare = (tag: string) => tag.trim().replace(/^W\//, '');
  return list.split(',').some((tag) => bare(tag) === bare(etag));
}

/** If-Range holds an entity tag (strong comparison) or an HTTP date (the file must not be newer). */
function ifRangeHolds(ifRange: string, object: Pick<ServedObject, 'etag' | 'lastModified'>): boolean {
  const value = ifRange.trim();
  if (value.startsWith('"') || value.startsWith('W/')) return value === object.etag;
  const date = Date.parse(value);
  if (!Number.isFinite(date) || !object.lastModified) return false;
  return Math.floor(object.lastModified.getTime() / 1000) <= Math.floor(date / 1000);
}

/** Decides the answer from the request's headers alone; no I/O. */
export function planRange(headers: ConditionalHeaders, object: Pick<ServedObject, 'size' | 'etag' | 'lastModified'>): RangePlan {
  const { size } = object;
  if (headers.ifNoneMatch && etagMatches(headers.ifNoneMatch, object.etag)) return { status: 304 };
  const whole = { status: 200 as const, start: 0, end: size - 1 };
  if (!headers.range) return whole;
  if (headers.ifRange && !ifRangeHolds(headers.ifRange, object)) return whole;
  const ranges = parseRange(size, headers.range, { combine: true });
  // -2: malformed, which the RFC says to ignore; another unit than bytes is ignored the same way.
  if (ranges === -2) return whole;
  if (ranges === -1) return { status: 416 };
  if (ranges.type !== 'bytes') return whole;
  if (ranges.length !== 1) return whole;
  const [{ start, end }] = ranges;
  return { status: 206, start, end };
}

function header(req: Request, name: string): string | undefined {
  const value = req.headers[name];
  return Array.isArray(value) ? value.join(',') : value;
}

/**
 * Answers GET or HEAD for one stored object. `cacheControl` is set on every answer; bodies stream
 * from storage, and a client that goes away stops the read.
 */
export async function sendStoredObject(
  req: Request,
  res: Response,
  storage: StorageService,
  object: ServedObject,
  cacheControl: string,
): Promise<void> {
  const plan = planRange(
    { range: header(req, 'range'), ifRange: header(req, 'if-range'), ifNoneMatch: header(req, 'if-none-match') },
    object,
  );
  res.setHeader('Accept-Ranges', 'bytes');
  res.setHeader('Cache-Control', cacheControl);
  res.setHeader('ETag', object.etag);
  if (object.lastModified) res.setHeader('Last-Modified', object.lastModified.toUTCString());

  if (plan.status === 304) {
    res.status(304).end();
    return;
  }
  if (plan.status === 416) {
    const body = JSON.stringify({
      statusCode: 416,
      error: STATUS_CODES[416],
      message: `The requested range is outside the file, which has ${object.size} bytes`,
    });
    res.status(416);
    res.setHeader('Content-Range', `bytes */${object.size}`);
    res.setHeader('Content-Type', 'application/json; charset=utf-8');
    res.setHeader('Content-Length', Buffer.byteLength(body));
    res.end(req.method === 'HEAD' ? undefined : body);
    return;
  }

  const length = object.size === 0 ? 0 : plan.end - plan.start + 1;
  res.status(plan.status);
  res.setHeader('Content-Type', object.contentType);
  res.setHeader('Content-Length', length);
  if (plan.status === 206) res.setHeader('Content-Range', `bytes ${plan.start}-${plan.end}/${object.size}`);
  if (req.method === 'HEAD' || length === 0) {
    res.end();
    return;
  }
  const body = await storage.openRead(object.key, { start: plan.start, end: plan.end });
  try {
    await pipeline(body, res);
  } catch (error) {
    // The client left (seeking makes browsers drop requests all the time) or the store failed
    // mid-way; the headers are out, so all that is left is to stop.
    const code = (error as NodeJS.ErrnoException).code;
    if (code !== 'ERR_STREAM_PREMATURE_CLOSE' && code !== 'ECONNRESET' && code !== 'EPIPE') throw error;
  } finally {
    body.destroy();
  }
}
