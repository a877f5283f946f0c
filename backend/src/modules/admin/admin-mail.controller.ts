import type { CapturedMail } from '@dialsheet/common';
import { Controller, Get, Param, UseGuards } from '@nestjs/common';
import { ApiBearerAuth, ApiOperation, ApiTags } from '@nestjs/swagger';
import { PlatformAdminGuard } from '../../core/guards/platform-admin.guard';
import { MailboxService } from '../mail/mailbox.service';

/** Messages caught by the local SMTP catcher, for demos and tests without a real mail server. */
@ApiTags('admin')
@ApiBearerAuth()
@UseGuards(PlatformAdminGuard)
@Controller('admin/mail')
export class AdminMailController {
  constructor(private readonly mailbox: MailboxService) {}

  @Get()
  @ApiOperation({ summary: 'Captured e-mail, newest first (platform administrators)' })
  list(): Promise<CapturedMail[]> {
    return this.mailbox.list();
  }

  @Get(':id')
  @ApiOperation({ summary: 'One captured e-mail (platform administrators)' })
  get(@Param('id') id: string): Promise<CapturedMail> {
    return this.mailbox.get(id);
  }
}
