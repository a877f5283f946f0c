import { CanActivate, ExecutionContext, Injectable, PayloadTooLargeException } from '@nestjs/common';
import type { Request, Response } from 'express';
import { AppConfig } from '../../../config/app-config';
import type { AuthUser } from '../../../core/auth-user';
import { RUN_WRITERS, RunAccessService } from '../../runs/run-access.service';
import { tooLargeMessage } from './byte-size';

/** Room for the multipart boundaries and part headers around the file itself. */
export const MULTIPART_OVERHEAD_BYTES = 64 * 1024;
/** Refused bodies up to this size are read and dropped; larger ones end the connection instead. */
const DRAIN_LIMIT_BYTES = 1024 * 1024;

/**
 * Runs before multer reads a single byte of the body: the caller must be allowed to change the
 * run, and a declared Content-Length must fit the limit. A refused upload is therefore never
 * written anywhere. For a large body the answer closes the connection, so the client stops
 * sending bytes nobody will keep.
 */
@Injectable()
export class UploadAccessGuard implements CanActivate {
  constructor(
    private readonly runAccess: RunAccessService,
    private readonly config: AppConfig,
  ) {}

  async canActivate(context: ExecutionContext): Promise<boolean> {
    const http = context.switchToHttp();
    const req = http.getRequest<Request & { user?: AuthUser }>();
    const res = http.getResponse<Response>();
    const declared = Number(req.headers['content-length'] ?? NaN);
    try {
      // The global JWT guard ran first; a missing user here would be a wiring mistake.
      if (!req.user) throw new Error('upload guard ran without an authenticated user');
      await this.runAccess.require(req.user, String(req.params.runId), RUN_WRITERS, { writable: true });
      if (Number.isFinite(declared) && declared > this.config.uploadMaxBytes + MULTIPART_OVERHEAD_BYTES) {
        throw new PayloadTooLargeException(tooLargeMessage(this.config.uploadMaxBytes));
      }
      return true;
    } catch (error) {
      const chunked = /chunked/i.test(String(req.headers['transfer-encoding'] ?? ''));
      if (chunked || (Number.isFinite(declared) && declared > DRAIN_LIMIT_BYTES)) {
        res.setHeader('Connection', 'close');
      } else if (Number.isFinite(declared) && declared > 0) {
        // A small body is read and dropped first (never stored), so the client finishes sending
        // and reads the answer instead of a broken pipe.
        await drain(req, DRAIN_WAIT_MS);
      }
      throw error;
    }
  }
}

/** Longest wait for a small refused body to arrive before answering anyway. */
const DRAIN_WAIT_MS = 2000;

function drain(req: Request, waitMs: number): Promise<void> {
  if (req.complete || req.readableEnded || req.destroyed) return Promise.resolve();
  return new Promise((resolve) => {
    const done = () => {
      clearTimeout(timer);
      req.off('end', done).off('close', done).off('error', done);
      resolve();
    };
    const timer = setTimeout(done, waitMs);
    req.on('end', done).on('close', done).on('error', done);
    req.resume();
  });
}
