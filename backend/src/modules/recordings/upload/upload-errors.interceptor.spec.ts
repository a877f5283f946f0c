import { BadRequestException, HttpException, PayloadTooLargeException, UnsupportedMediaTypeException } from '@nestjs/common';
import { transformException } from '@nestjs/platform-express/multer/multer/multer.utils';
import { describe, expect, it } from 'vitest';
import { UPLOAD_INTERRUPTED, uploadErrorFor } from './upload-errors.interceptor';

/** A MulterError (multer marks them by code) as Nest's FileInterceptor hands it on. */
const fromMulter = (code: string, field?: string) =>
  transformException(Object.assign(new Error(code), { name: 'MulterError', code, field })) as HttpException;

const fromBusboy = (message: string) => transformException(new Error(message)) as HttpException;

describe('uploadErrorFor', () => {
  it('turns multer’s size limit into a 413 that states the limit', () => {
    const mapped = uploadErrorFor(fromMulter('LIMIT_FILE_SIZE', 'file'), 2 * 1024 * 1024) as HttpException;
    expect(mapped).toBeInstanceOf(PayloadTooLargeException);
    expect(mapped.message).toBe('The file is larger than the limit of 2 MB');
  });

  it('explains the other refusals in terms of the upload form', () => {
    expect((uploadErrorFor(fromMulter('LIMIT_FILE_COUNT'), 1) as HttpException).message).toBe('Upload one file at a time');
    const wrongField = uploadErrorFor(fromMulter('LIMIT_UNEXPECTED_FILE', 'video'), 1) as HttpException;
    expect(wrongField).toBeInstanceOf(BadRequestException);
    expect(wrongField.message).toBe('Send the video in the form field "file" (got "video")');
    expect((uploadErrorFor(fromMulter('LIMIT_PART_COUNT'), 1) as HttpException).message).toMatch(/only the field "file"/);
  });

  it('calls a connection that broke mid-body an interrupted upload (400), not a server error', () => {
    for (const error of [new Error('Request aborted'), new Error('Request closed'), fromBusboy('Unexpected end of form')]) {
      const mapped = uploadErrorFor(error, 1) as HttpException;
      expect(mapped).toBeInstanceOf(BadRequestException);
      expect(mapped.message).toBe(UPLOAD_INTERRUPTED);
    }
  });

  it('leaves our own errors and foreign ones alone', () => {
    const typeError = new UnsupportedMediaTypeException('This file is not a video (found: text/plain)');
    expect(uploadErrorFor(typeError, 1)).toBe(typeError);
    const plain = new Error('disk');
    expect(uploadErrorFor(plain, 1)).toBe(plain);
  });
});
