import type { CampaignMember } from '@dialsheet/common';
import { Body, Controller, Delete, Get, HttpCode, Param, Put } from '@nestjs/common';
import { ApiBearerAuth, ApiOperation, ApiTags } from '@nestjs/swagger';
import type { AuthUser } from '../../core/auth-user';
import { CurrentUser } from '../../core/decorators/current-user.decorator';
import { UpdateMemberRolesDto } from './dto/update-member-roles.dto';
import { MembersService } from './members.service';

@ApiTags('members')
@ApiBearerAuth()
@Controller('campaigns/:campaignId/members')
export class MembersController {
  constructor(private readonly members: MembersService) {}

  @Get()
  @ApiOperation({ summary: 'People in the campaign and their roles (any member)' })
  list(@CurrentUser() user: AuthUser, @Param('campaignId') campaignId: string): Promise<CampaignMember[]> {
    return this.members.list(user, campaignId);
  }

  @Put(':userId')
  @ApiOperation({ summary: "Set a member's roles (lead); the last lead cannot give up the role" })
  updateRoles(
    @CurrentUser() user: AuthUser,
    @Param('campaignId') campaignId: string,
    @Param('userId') userId: string,
    @Body() dto: UpdateMemberRolesDto,
  ): Promise<CampaignMember> {
    return this.members.updateRoles(user, campaignId, userId, dto);
  }

  @Delete(':userId')
  @HttpCode(204)
  @ApiOperation({ summary: 'Remove a member (lead); the last lead cannot be removed' })
  remove(
    @CurrentUser() user: AuthUser,
    @Param('campaignId') campaignId: string,
    @Param('userId') userId: string,
  ): Promise<void> {
    return this.members.remove(user, campaignId, userId);
  }
}
