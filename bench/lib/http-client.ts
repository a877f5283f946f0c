// HTTP as the benchmarks use it: JSON calls with the bearer token, and a multipart upload that
// streams the file from disk (it is never held in memory on the client either).
import { randomBytes } from 'node:crypto';
import fs from 'node:fs';
import http from 'node:http';
import path from 'node:path';
import { Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';

export class HttpError extends Error {
  constructor(
    readonly status: number,
    readonly body: string,
    what: string,
  ) {
    super(`${what}: HTTP ${status} ${body.slice(0, 300)}`);
  }
}

export interface UploadOutcome {
  status: number;
  /** The answer's body as text (JSON on success and on refusal). */
  body: string;
  /** From the first byte sent to the last byte of the answer, in seconds. */
  seconds: number;
  /** Bytes of the whole request body (multipart framing included). */
  requestBytes: number;
}

/**
 * One request on its own connection: the benchmarks make few such calls, often after a long
 * pause, and a reused idle connection the server has just closed would fail a POST.
 */
function call(url: URL, method: string, headers: http.OutgoingHttpHeaders, body?: unknown): Promise<{ status: number; body: string }> {
  const payload = body === undefined ? undefined : Buffer.from(JSON.stringify(body));
  return new Promise((resolve, reject) => {
    const request = http.request(
      url,
      {
        method,
        agent: false,
        headers: payload ? { ...headers, 'content-type': 'application/json', 'content-length': String(payload.length) } : headers,
      },
      (response) => {
        const chunks: Buffer[] = [];
        response.on('data', (chunk: Buffer) => chunks.push(chunk));
        response.on('error', reject);
        response.on('end', () => resolve({ status: response.statusCode ?? 0, body: Buffer.concat(chunks).toString('utf8') }));
      },
    );
    request.setTimeout(30_000, () => request.destroy(new Error(`${method} ${url.pathname}: no answer within 30 s`)));
    request.on('error', (error) => reject(new Error(`${method} ${url.pathname}: ${error.message}`)));
    request.end(payload);
  });
}

export class ApiClient {
  private constructor(
    readonly baseUrl: string,
    private readonly token: string,
  ) {}

  static async signIn(baseUrl: string, email: string, password: string): Promise<ApiClient> {
    const answer = await call(new URL('/api/auth/login', baseUrl), 'POST', {}, { email, password });
    if (answer.status !== 200) throw new HttpError(answer.status, answer.body, `sign-in as ${email}`);
    return new ApiClient(baseUrl, (JSON.parse(answer.body) as { accessToken: string }).accessToken);
  }

  /** The Authorization header value, for benchmarks that make their own requests. */
  get authorization(): string {
    return `Bearer ${this.token}`;
  }

  /** A JSON call; anything but a 2xx answer throws with the server's message. */
  async json<T>(method: string, route: string, body?: unknown): Promise<T> {
    const answer = await call(new URL(route, this.baseUrl), method, { authorization: `Bearer ${this.token}` }, body);
    if (answer.status < 200 || answer.status > 299) throw new HttpError(answer.status, answer.body, `${method} ${route}`);
    return (answer.body ? JSON.parse(answer.body) : undefined) as T;
  }

  /**
   * POSTs `file` as the multipart field "file". The body is the multipart head, the file piped
   * from a read stream, and the closing boundary, with a Content-Length computed up front.
   */
  async upload(route: string, file: string, options: { contentType?: string; chunkBytes?: number } = {}): Promise<UploadOutcome> {
    const size = fs.statSync(file).size;
    const boundary = `----dialsheet-bench-${randomBytes(12).toString('hex')}`;
    const head = Buffer.from(
      `--${boundary}\r\n` +
        `Content-Disposition: form-data; name="file"; filename="${path.basename(file)}"\r\n` +
        `Content-Type: ${options.contentType ?? 'video/mp4'}\r\n\r\n`,
    );
    const foot = Buffer.from(`\r\n--${boundary}--\r\n`);
    const requestBytes = head.length + size + foot.length;
    const url = new URL(route, this.baseUrl);
    const chunkBytes = options.chunkBytes ?? 1024 * 1024;

    async function* body(): AsyncGenerator<Buffer> {
      yield head;
      for await (const chunk of fs.createReadStream(file, { highWaterMark: chunkBytes })) yield chunk as Buffer;
      yield foot;
    }

    const started = process.hrtime.bigint();
    return new Promise<UploadOutcome>((resolve, reject) => {
      let answered = false;
      const request = http.request(
        url,
        {
          method: 'POST',
          agent: false,
          headers: {
            authorization: `Bearer ${this.token}`,
            'content-type': `multipart/form-data; boundary=${boundary}`,
            'content-length': String(requestBytes),
          },
        },
        (response) => {
          answered = true;
          const chunks: Buffer[] = [];
          response.on('data', (chunk: Buffer) => chunks.push(chunk));
          response.on('error', reject);
          response.on('end', () =>
            resolve({
              status: response.statusCode ?? 0,
              body: Buffer.concat(chunks).toString('utf8'),
              seconds: Number(process.hrtime.bigint() - started) / 1e9,
              requestBytes,
            }),
          );
        },
      );
      pipeline(Readable.from(body()), request).catch((error: unknown) => {
        // A server that refuses early (413, 415) may close while we still send; its answer wins.
        if (!answered) setTimeout(() => (answered ? undefined : reject(error)), 1000);
      });
    });
  }
}
