import { AuditEntryEntity } from '../modules/audit/audit-entry.entity';
import { PasswordResetEntity } from '../modules/auth/password-reset.entity';
import { RevokedTokenEntity } from '../modules/auth/revoked-token.entity';
import { CampaignMemberEntity } from '../modules/campaigns/campaign-member.entity';
import { CampaignEntity } from '../modules/campaigns/campaign.entity';
import { ChannelEntity } from '../modules/channels/channel.entity';
import { DisplayRegionEntity } from '../modules/channels/display-region.entity';
import { InvitationEntity } from '../modules/invitations/invitation.entity';
import { RecordingFrameTimesEntity } from '../modules/recordings/recording-frame-times.entity';
import { RecordingEntity } from '../modules/recordings/recording.entity';
import { ReadingEntity } from '../modules/readings/reading.entity';
import { ResolutionEntity } from '../modules/readings/resolution.entity';
import { RunEntity } from '../modules/runs/run.entity';
import { SheetChannelEntity } from '../modules/sheets/sheet-channel.entity';
import { SheetEntity } from '../modules/sheets/sheet.entity';
import { UserEntity } from '../modules/users/user.entity';

export const entities = [
  UserEntity,
  CampaignEntity,
  CampaignMemberEntity,
  InvitationEntity,
  PasswordResetEntity,
  RevokedTokenEntity,
  AuditEntryEntity,
  RunEntity,
  RecordingEntity,
  RecordingFrameTimesEntity,
  ChannelEntity,
  DisplayRegionEntity,
  SheetEntity,
  SheetChannelEntity,
  ReadingEntity,
  ResolutionEntity,
];
