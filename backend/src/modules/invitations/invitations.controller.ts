import type { InvitationPreview, LoginResponse } from '@dialsheet/common';
import { Body, Controller, Get, HttpCode, Param, Post } from '@nestjs/common';
import { ApiOperation, ApiTags } from '@nestjs/swagger';
import { Public } from '../../core/decorators/public.decorator';
import { AcceptInvitationDto } from './dto/accept-invitation.dto';
import { InvitationsService } from './invitations.service';

/** Reached from the e-mailed link, before the invitee has (or has signed in to) an account. */
@ApiTags('invitations')
@Public()
@Controller('invitations')
export class InvitationsController {
  constructor(private readonly invitations: InvitationsService) {}

  @Post('accept')
  @HttpCode(200)
  @ApiOperation({ summary: 'Accept an invitation (creates the account if needed) and sign in' })
  accept(@Body() dto: AcceptInvitationDto): Promise<LoginResponse> {
    return this.invitations.accept(dto);
  }

  @Get(':token')
  @ApiOperation({ summary: 'What an invitation link invites to' })
  preview(@Param('token') token: string): Promise<InvitationPreview> {
    return this.invitations.preview(token);
  }
}
