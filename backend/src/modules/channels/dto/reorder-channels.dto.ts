import type { ReorderChannelsRequest } from '@dialsheet/common';
import { ApiProperty } from '@nestjs/swagger';
import { ArrayMaxSize, IsArray, IsUUID } from 'class-validator';

export class ReorderChannelsDto implements ReorderChannelsRequest {
  @ApiProperty({ type: [String], format: 'uuid', description: 'Every channel of the campaign once, in the new order' })
  @IsArray({ message: 'channelIds must be an array of channel ids' })
  @ArrayMaxSize(500)
  @IsUUID('all', { each: true, message: 'channelIds must contain channel ids (UUIDs)' })
  channelIds: string[];
}
