import { env } from '@/config/env';
import { ApiRequestError, messageFrom, type QueryParams } from '@/lib/api-client';
import { authToken } from '@/lib/auth-token';
import type { ApiError } from '@dialsheet/common';

export interface FetchedFile {
  blob: Blob;
  /** From the server's Content-Disposition, or null when it sent none. */
  fileName: string | null;
}

/**
 * The file name of a Content-Disposition header: the RFC 6266 / RFC 5987 `filename*=UTF-8''…`
 * form first (it carries non-ASCII names), then the plain `filename="…"`.
 */
export function fileNameFromDisposition(header: string | null): string | null {
  if (!header) return null;
  const extended = /filename\*\s*=\s*(?:UTF-8|utf-8)''([^;]+)/.exec(header);
  if (extended) {
    try {
      return decodeURIComponent(extended[1].trim().replace(/^"|"$/g, ''));
    } catch {
      // A malformed escape: fall through to the plain form.
    }
  }
  const plain = /filename\s*=\s*("([^"]*)"|[^;]+)/.exec(header);
  if (!plain) return null;
  const name = (plain[2] ?? plain[1]).trim();
  return name || null;
}

/**
 * A file from the API. The API wants the bearer token, which a plain link cannot send, so the file
 * is fetched here and handed to the browser as a blob. `onProgress` hears the bytes received so
 * far (exports are streamed, so the total is usually unknown).
 */
export async function fetchFile(path: string, params: QueryParams, onProgress?: (bytes: number) => void): Promise<FetchedFile> {
  const query = new URLSearchParams();
  for (const [key, value] of Object.entries(params)) {
    if (value !== undefined && value !== null && value !== '') query.set(key, String(value));
  }
  const token = authToken.get();
  const headers: Record<string, string> = {};
  if (token) headers.Authorization = `Bearer ${token}`;

  let response: Response;
  try {
    response = await fetch(`${env.apiBase}${path}?${query.toString()}`, { method: 'GET', headers });
  } catch {
    throw new ApiRequestError(0, 'Cannot reach the server. Check your connection and try again.', null);
  }

  if (!response.ok) {
    let body: ApiError | null = null;
    try {
      body = (await response.json()) as ApiError;
    } catch {
      body = null;
    }
    // Same rule as the API client: a refused token ends the session.
    if (response.status === 401 && token) authToken.clear('expired');
    throw new ApiRequestError(response.status, messageFrom(body, response.status), body);
  }

  const fileName = fileNameFromDisposition(response.headers.get('Content-Disposition'));
  const type = response.headers.get('Content-Type') ?? 'application/octet-stream';
  if (!response.body || !onProgress) return { blob: await response.blob(), fileName };

  const reader = response.body.getReader();
  const chunks: BlobPart[] = [];
  let received = 0;
  try {
    for (;;) {
      const { done, value } = await reader.read();
      if (done) break;
      chunks.push(value as BlobPart);
      received += value.byteLength;
      onProgress(received);
    }
  } catch {
    // The server cuts the connection when an export fails mid-stream: never save half a file.
    throw new ApiRequestError(0, 'The download stopped before the end; nothing was saved. Try again.', null);
  }
  return { blob: new Blob(chunks, { type }), fileName };
}

/** Hands a blob to the browser's download (an object URL on a temporary link). */
export function saveBlob(blob: Blob, fileName: string): void {
  const url = URL.createObjectURL(blob);
  const link = document.createElement('a');
  link.href = url;
  link.download = fileName;
  link.rel = 'noopener';
  document.body.appendChild(link);
  link.click();
  link.remove();
  // Revoking at once can cancel the download in some browsers; a minute is plenty.
  window.setTimeout(() => URL.revokeObjectURL(url), 60_000);
}
