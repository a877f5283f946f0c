import {
  BadRequestException,
  CallHandler,
  ExecutionContext,
  HttpException,
  Injectable,
  NestInterceptor,
  PayloadTooLargeException,
} from '@nestjs/common';
import { catchError, Observable, throwError } from 'rxjs';
import { AppConfig } from '../../../config/app-config';
import { tooLargeMessage } from './byte-size';

interface MulterErrorLike {
  code?: string;
  field?: string;
}

export const UPLOAD_INTERRUPTED = 'The upload was interrupted before the whole file arrived; nothing was kept. Try again.';

/** multer's words when the client goes away mid-body, and busboy's when the body stops short. */
const INTERRUPTED = /^(Request aborted|Request closed|Multipart: Unexpected end of (form|file))$/;

/** Our words for multer's refusals; the rest (e.g. 415 from the type check) pass unchanged. */
export function uploadErrorFor(error: unknown, limitBytes: number): unknown {
  // A client that left gets no answer anyway; a 400 keeps it out of the server-error log.
  if (error instanceof Error && INTERRUPTED.test(error.message)) return new BadRequestException(UPLOAD_INTERRUPTED, { cause: error });
  if (!(error instanceof HttpException)) return error;
  const cause = error.cause as MulterErrorLike | undefined;
  switch (cause?.code) {
    case 'LIMIT_FILE_SIZE':
      return new PayloadTooLargeException(tooLargeMessage(limitBytes), { cause });
    case 'LIMIT_FILE_COUNT':
      return new BadRequestException('Upload one file at a time', { cause });
    case 'LIMIT_UNEXPECTED_FILE':
      return new BadRequestException(`Send the video in the form field "file" (got "${String(cause.field ?? '').slice(0, 40)}")`, { cause });
    case 'LIMIT_PART_COUNT':
    case 'LIMIT_FIELD_COUNT':
    case 'LIMIT_FIELD_KEY':
    case 'LIMIT_FIELD_VALUE':
      return new BadRequestException('The upload form carries more than the file; send only the field "file"', { cause });
    default:
      return error;
  }
}

/** Placed before FileInterceptor, so multer's errors pass through here on their way out. */
@Injectable()
export class UploadErrorsInterceptor implements NestInterceptor {
  constructor(private readonly config: AppConfig) {}

  intercept(_context: ExecutionContext, next: CallHandler): Observable<unknown> {
    return next.handle().pipe(catchError((error: unknown) => throwError(() => uploadErrorFor(error, this.config.uploadMaxBytes))));
  }
}
