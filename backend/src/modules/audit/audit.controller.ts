import type { AuditEntry, Page } from '@dialsheet/common';
import { Controller, Get, Param, Query } from '@nestjs/common';
import { ApiBearerAuth, ApiOperation, ApiTags } from '@nestjs/swagger';
import type { AuthUser } from '../../core/auth-user';
import { CurrentUser } from '../../core/decorators/current-user.decorator';
import { AuditService } from './audit.service';
import { AuditQueryDto } from './dto/audit-query.dto';

/** Read-only on purpose: the trail has no update or delete route. */
@ApiTags('audit')
@ApiBearerAuth()
@Controller('campaigns/:campaignId/audit')
export class AuditController {
  constructor(private readonly audit: AuditService) {}

  @Get()
  @ApiOperation({ summary: "The campaign's audit trail, newest first (any member)" })
  list(
    @CurrentUser() user: AuthUser,
    @Param('campaignId') campaignId: string,
    @Query() query: AuditQueryDto,
  ): Promise<Page<AuditEntry>> {
    return this.audit.list(user, campaignId, query);
  }
}
