import type { NotificationSettings } from '@dialsheet/common';
import { Body, Controller, Get, Put } from '@nestjs/common';
import { ApiBearerAuth, ApiOperation, ApiTags } from '@nestjs/swagger';
import type { AuthUser } from '../../core/auth-user';
import { CurrentUser } from '../../core/decorators/current-user.decorator';
import { NotificationSettingsDto } from './dto/notification-settings.dto';
import { NotificationsService } from './notifications.service';

@ApiTags('notifications')
@ApiBearerAuth()
@Controller('users/me/notifications')
export class NotificationsController {
  constructor(private readonly notifications: NotificationsService) {}

  @Get()
  @ApiOperation({ summary: 'Which notification e-mails I get (each kind on or off)' })
  get(@CurrentUser() user: AuthUser): Promise<NotificationSettings> {
    return this.notifications.settings(user);
  }

  @Put()
  @ApiOperation({ summary: 'Switch notification kinds on or off (kinds left out stay as they are)' })
  put(@CurrentUser() user: AuthUser, @Body() dto: NotificationSettingsDto): Promise<NotificationSettings> {
    return this.notifications.updateSettings(user, dto);
  }
}
