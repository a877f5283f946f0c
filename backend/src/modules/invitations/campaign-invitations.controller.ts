import type { Invitation } from '@dialsheet/common';
import { Body, Controller, Delete, Get, HttpCode, Param, Post } from '@nestjs/common';
import { ApiBearerAuth, ApiOperation, ApiTags } from '@nestjs/swagger';
import type { AuthUser } from '../../core/auth-user';
import { CurrentUser } from '../../core/decorators/current-user.decorator';
import { CreateInvitationDto } from './dto/create-invitation.dto';
import { InvitationsService } from './invitations.service';

@ApiTags('invitations')
@ApiBearerAuth()
@Controller('campaigns/:campaignId/invitations')
export class CampaignInvitationsController {
  constructor(private readonly invitations: InvitationsService) {}

  @Get()
  @ApiOperation({ summary: 'Invitations of a campaign, newest first (lead)' })
  list(@CurrentUser() user: AuthUser, @Param('campaignId') campaignId: string): Promise<Invitation[]> {
    return this.invitations.list(user, campaignId);
  }

  @Post()
  @ApiOperation({ summary: 'Invite someone by e-mail; the link works once, for 7 days (lead)' })
  create(
    @CurrentUser() user: AuthUser,
    @Param('campaignId') campaignId: string,
    @Body() dto: CreateInvitationDto,
  ): Promise<Invitation> {
    return this.invitations.create(user, campaignId, dto);
  }

  @Delete(':invitationId')
  @HttpCode(204)
  @ApiOperation({ summary: 'Revoke a pending invitation (lead)' })
  revoke(
    @CurrentUser() user: AuthUser,
    @Param('campaignId') campaignId: string,
    @Param('invitationId') invitationId: string,
  ): Promise<void> {
    return this.invitations.revoke(user, campaignId, invitationId);
  }
}
