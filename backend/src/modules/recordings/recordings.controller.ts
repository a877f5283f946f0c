import type { MediaUrls, Recording, RecordingFrames } from '@dialsheet/common';
import { Controller, Delete, Get, HttpCode, Param, Post, UploadedFile, UseGuards, UseInterceptors } from '@nestjs/common';
import { FileInterceptor } from '@nestjs/platform-express';
import {
  ApiBearerAuth,
  ApiBody,
  ApiConflictResponse,
  ApiConsumes,
  ApiCreatedResponse,
  ApiNoContentResponse,
  ApiOperation,
  ApiPayloadTooLargeResponse,
  ApiTags,
  ApiUnsupportedMediaTypeResponse,
} from '@nestjs/swagger';
import type { AuthUser } from '../../core/auth-user';
import { CurrentUser } from '../../core/decorators/current-user.decorator';
import { RecordingsService } from './recordings.service';
import type { HashedFile } from './upload/hashing-disk-storage';
import { UploadAccessGuard } from './upload/upload-access.guard';
import { UploadErrorsInterceptor } from './upload/upload-errors.interceptor';

@ApiTags('recordings')
@ApiBearerAuth()
@Controller()
export class RecordingsController {
  constructor(private readonly recordings: RecordingsService) {}

  @Post('runs/:runId/recording')
  @UseGuards(UploadAccessGuard)
  @UseInterceptors(UploadErrorsInterceptor, FileInterceptor('file'))
  @ApiOperation({
    summary: 'Upload (or replace) the video of a run (lead, engineer)',
    description:
      'multipart/form-data with one field "file". The body streams to disk with a SHA-256 computed on the way; ' +
      'the type is read from the bytes. Processing (probe, frame times, proxy, poster) runs as a job afterwards.',
  })
  @ApiConsumes('multipart/form-data')
  @ApiBody({ schema: { type: 'object', required: ['file'], properties: { file: { type: 'string', format: 'binary' } } } })
  @ApiCreatedResponse({ description: 'The new recording, status "uploaded"' })
  @ApiConflictResponse({ description: 'The same file is already a recording in this campaign (body names it in duplicateOf)' })
  @ApiPayloadTooLargeResponse({ description: 'Over UPLOAD_MAX_BYTES' })
  @ApiUnsupportedMediaTypeResponse({ description: 'The bytes are not a video container' })
  upload(@CurrentUser() user: AuthUser, @Param('runId') runId: string, @UploadedFile() file: HashedFile | undefined): Promise<Recording> {
    return this.recordings.upload(user, runId, file);
  }

  @Get('runs/:runId/recording')
  @ApiOperation({ summary: 'The run’s recording with its processing status and progress (any member)' })
  get(@CurrentUser() user: AuthUser, @Param('runId') runId: string): Promise<Recording> {
    return this.recordings.get(user, runId);
  }

  @Delete('runs/:runId/recording')
  @HttpCode(204)
  @ApiNoContentResponse({ description: 'The recording and its files are gone; the run stays' })
  @ApiOperation({ summary: 'Delete the run’s recording (lead, engineer)' })
  remove(@CurrentUser() user: AuthUser, @Param('runId') runId: string): Promise<void> {
    return this.recordings.remove(user, runId);
  }

  @Get('recordings/:recordingId/frames')
  @ApiOperation({ summary: 'Presentation time of every frame and keyframe, in seconds (any member; 409 while probing)' })
  frames(@CurrentUser() user: AuthUser, @Param('recordingId') recordingId: string): Promise<RecordingFrames> {
    return this.recordings.frames(user, recordingId);
  }

  @Post('recordings/:recordingId/media-urls')
  @HttpCode(200)
  @ApiOperation({ summary: 'Short-lived signed links to the proxy, original and poster (any member)' })
  mediaUrls(@CurrentUser() user: AuthUser, @Param('recordingId') recordingId: string): Promise<MediaUrls> {
    return this.recordings.mediaUrls(user, recordingId);
  }
}
