// Hand-made tokens and raw requests for the security tests: nothing here goes through a library
// that would refuse to build a malformed token or tidy a path before it is sent.

import { createHmac } from 'node:crypto';
import { request as httpRequest } from 'node:http';

export const b64url = (value: object | string | Buffer): string =>
  Buffer.from(typeof value === 'string' || Buffer.isBuffer(value) ? value : JSON.stringify(value)).toString('base64url');

/** A compact JWS (RFC 7515 §7.1) signed with HMAC-SHA256 under `secret`, whatever the header claims. */
export function hs256(header: object, payload: object, secret: string | Buffer): string {
  const signingInput = `${b64url(header)}.${b64url(payload)}`;
  return `${signingInput}.${createHmac('sha256', secret).update(signingInput).digest('base64url')}`;
}

export function hs512(header: object, payload: object, secret: string | Buffer): string {
  const signingInput = `${b64url(header)}.${b64url(payload)}`;
  return `${signingInput}.${createHmac('sha512', secret).update(signingInput).digest('base64url')}`;
}

export function decodePayload(token: string): Record<string, unknown> {
  return JSON.parse(Buffer.from(token.split('.')[1], 'base64url').toString('utf8')) as Record<string, unknown>;
}

export interface RawResponse {
  status: number;
  headers: Record<string, string | string[] | undefined>;
  body: Buffer;
}

/** GET with the path sent byte for byte as given (no URL normalisation of "..", "%2e" or "//"). */
export function rawGet(port: number, path: string, headers: Record<string, string> = {}): Promise<RawResponse> {
  return new Promise((resolve, reject) => {
    const req = httpRequest({ host: '127.0.0.1', port, method: 'GET', path, headers }, (res) => {
      const parts: Buffer[] = [];
      res.on('data', (c: Buffer) => parts.push(c));
      res.on('end', () => resolve({ status: res.statusCode ?? 0, headers: res.headers, body: Buffer.concat(parts) }));
      res.on('error', reject);
    });
    req.on('error', reject);
    req.end();
  });
}

/** Ways to spell "go up two folders" in one path segment or query value. */
export const TRAVERSALS = [
  '../../x',
  '..%2f..%2fx',
  '%2e%2e%2f%2e%2e%2fx',
  '%2E%2E%2F%2E%2E%2Fx',
  '..%5c..%5cx',
  '%252e%252e%252fx',
  '....%2f%2f....%2f%2fx',
  '..%c0%af..%c0%afx',
  '%00..%2fx',
];

/**
 * A multipart upload of `content` in field "file" with `filename` written verbatim into the
 * Content-Disposition header (form libraries would strip the folders first).
 */
export function rawUpload(port: number, path: string, token: string, filename: string, content: Buffer): Promise<RawResponse> {
  const boundary = `matrix${Date.now().toString(36)}`;
  const head = Buffer.from(
    `--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="${filename}"\r\nContent-Type: video/mp4\r\n\r\n`,
    'latin1',
  );
  const tail = Buffer.from(`\r\n--${boundary}--\r\n`);
  const body = Buffer.concat([head, content, tail]);
  return new Promise((resolve, reject) => {
    const req = httpRequest(
      {
        host: '127.0.0.1',
        port,
        method: 'POST',
        path,
        headers: {
          Authorization: `Bearer ${token}`,
          'Content-Type': `multipart/form-data; boundary=${boundary}`,
          'Content-Length': String(body.length),
        },
      },
      (res) => {
        const parts: Buffer[] = [];
        res.on('data', (c: Buffer) => parts.push(c));
        res.on('end', () => resolve({ status: res.statusCode ?? 0, headers: res.headers, body: Buffer.concat(parts) }));
        res.on('error', reject);
      },
    );
    req.on('error', reject);
    req.end(body);
  });
}

/** Any request with the body sent byte for byte as given. */
export function rawRequest(port: number, method: string, path: string, headers: Record<string, string>, body: Buffer | string): Promise<RawResponse> {
  const payload = Buffer.isBuffer(body) ? body : Buffer.from(body, 'latin1');
  return new Promise((resolve, reject) => {
    const req = httpRequest({ host: '127.0.0.1', port, method, path, headers: { 'Content-Length': String(payload.length), ...headers } }, (res) => {
      const parts: Buffer[] = [];
      res.on('data', (c: Buffer) => parts.push(c));
      res.on('end', () => resolve({ status: res.statusCode ?? 0, headers: res.headers, body: Buffer.concat(parts) }));
      res.on('error', reject);
    });
    req.on('error', reject);
    req.end(payload);
  });
}
