import { Controller, ForbiddenException, Get, Head, NotFoundException, Param, Query, Req, Res } from '@nestjs/common';
import { ApiOperation, ApiProduces, ApiTags } from '@nestjs/swagger';
import type { Request, Response } from 'express';
import { Public } from '../../core/decorators/public.decorator';
import { StorageService } from '../../storage/storage.service';
import { isMediaKind } from './media/media-url-signer';
import { sendStoredObject } from './media/range-response';
import { RecordingsService } from './recordings.service';

/**
 * Media for <video> and <img> elements, which cannot send a bearer token: the signed query
 * string is the authorisation. HEAD is declared first so Express does not route it to GET.
 */
@ApiTags('recordings')
@Controller('media')
export class MediaController {
  constructor(
    private readonly recordings: RecordingsService,
    private readonly storage: StorageService,
  ) {}

  @Public()
  @Head(':recordingId/:kind')
  @ApiOperation({ summary: 'Headers of a media file (signed link)' })
  head(
    @Param('recordingId') recordingId: string,
    @Param('kind') kind: string,
    @Query('exp') exp: unknown,
    @Query('sig') sig: unknown,
    @Req() req: Request,
    @Res() res: Response,
  ): Promise<void> {
    return this.serve(recordingId, kind, exp, sig, req, res);
  }

  @Public()
  @Get(':recordingId/:kind')
  @ApiOperation({
    summary: 'A recording’s proxy, original or poster through a signed link, with HTTP range requests',
    description: 'kind is proxy, original or poster; exp and sig come from POST /api/recordings/:recordingId/media-urls.',
  })
  @ApiProduces('video/mp4', 'image/jpeg', 'application/octet-stream')
  get(
    @Param('recordingId') recordingId: string,
    @Param('kind') kind: string,
    @Query('exp') exp: unknown,
    @Query('sig') sig: unknown,
    @Req() req: Request,
    @Res() res: Response,
  ): Promise<void> {
    return this.serve(recordingId, kind, exp, sig, req, res);
  }

  private async serve(recordingId: string, kind: string, exp: unknown, sig: unknown, req: Request, res: Response): Promise<void> {
    const check = this.recordings.checkMediaLink(recordingId, kind, exp, sig);
    if (!check.ok) throw new ForbiddenException(check.message);
    if (!isMediaKind(kind)) throw new ForbiddenException('This media link is not valid');
    const target = await this.recordings.mediaTarget(recordingId, kind);
    const stat = await this.storage.stat(target.key);
    if (!stat) throw new NotFoundException('This file is missing from storage');
    const etag =
      target.etag ?? stat.etag ?? `"${stat.size.toString(16)}-${(stat.lastModified?.getTime() ?? 0).toString(16)}"`;
    const secondsLeft = Math.max(0, Number(exp) - Math.floor(Date.now() / 1000));
    await sendStoredObject(
      req,
      res,
      this.storage,
      { key: target.key, size: stat.size, contentType: target.contentType, etag, lastModified: stat.lastModified },
      `private, max-age=${secondsLeft}`,
    );
  }
}
