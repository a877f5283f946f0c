import type { AdminUser } from '@dialsheet/common';
import { Body, Controller, Get, Param, Patch, UseGuards } from '@nestjs/common';
import { ApiBearerAuth, ApiOperation, ApiTags } from '@nestjs/swagger';
import type { AuthUser } from '../../core/auth-user';
import { CurrentUser } from '../../core/decorators/current-user.decorator';
import { PlatformAdminGuard } from '../../core/guards/platform-admin.guard';
import { uuidParam } from '../../core/pipes/uuid-param.pipe';
import { UpdateUserDto } from './dto/update-user.dto';
import { UsersService } from './users.service';

@ApiTags('users')
@ApiBearerAuth()
@UseGuards(PlatformAdminGuard)
@Controller('users')
export class UsersController {
  constructor(private readonly users: UsersService) {}

  @Get()
  @ApiOperation({ summary: 'List every account (platform administrators only)' })
  list(): Promise<AdminUser[]> {
    return this.users.list();
  }

  @Patch(':id')
  @ApiOperation({ summary: 'Disable/enable an account or grant/remove administrator rights' })
  update(
    @CurrentUser() admin: AuthUser,
    @Param('id', uuidParam('User')) id: string,
    @Body() dto: UpdateUserDto,
  ): Promise<AdminUser> {
    return this.users.update(admin, id, dto);
  }
}
