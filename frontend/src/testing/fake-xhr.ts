import { vi } from 'vitest';

/**
 * Stands in for XMLHttpRequest (the network boundary of uploads, as fetch-stub is for the API
 * client) so a test can play the upload's progress events and the server's answer in any order
 * and at any pace. Only what the upload code uses is here.
 */
export class FakeXhr extends EventTarget {
  static instances: FakeXhr[] = [];

  readonly upload = new EventTarget();
  method = '';
  url = '';
  headers: Record<string, string> = {};
  body: unknown = null;
  status = 0;
  responseText = '';
  aborted = false;

  constructor() {
    super();
    FakeXhr.instances.push(this);
  }

  open(method: string, url: string): void {
    this.method = method;
    this.url = url;
  }

  setRequestHeader(name: string, value: string): void {
    this.headers[name] = value;
  }

  send(body: unknown): void {
    this.body = body;
  }

  abort(): void {
    this.aborted = true;
    this.dispatchEvent(new Event('abort'));
  }

  /** The browser reports `loaded` of `total` request bytes sent. */
  progress(loaded: number, total: number): void {
    this.upload.dispatchEvent(Object.assign(new Event('progress'), { loaded, total, lengthComputable: true }));
  }

  /** The server answers. */
  respond(status: number, body: unknown): void {
    this.status = status;
    this.responseText = body === undefined ? '' : JSON.stringify(body);
    this.dispatchEvent(new Event('load'));
  }

  /** The connection breaks before an answer. */
  fail(): void {
    this.dispatchEvent(new Event('error'));
  }
}

/** Installs FakeXhr as the global XMLHttpRequest for this test (undone by vi.unstubAllGlobals). */
export function stubXhr(): typeof FakeXhr {
  FakeXhr.instances = [];
  vi.stubGlobal('XMLHttpRequest', FakeXhr);
  return FakeXhr;
}

/** The latest request once the code under test has made it. */
export async function nextXhr(): Promise<FakeXhr> {
  await vi.waitFor(() => {
    if (FakeXhr.instances.length === 0) throw new Error('no upload request yet');
  });
  return FakeXhr.instances[FakeXhr.instances.length - 1];
}
