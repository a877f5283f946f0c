import type { HealthStatus } from '@dialsheet/common';
import { Controller, Get, HttpStatus, Res } from '@nestjs/common';
import { ApiOperation, ApiServiceUnavailableResponse, ApiTags } from '@nestjs/swagger';
import type { Response } from 'express';
import { Public } from '../../core/decorators/public.decorator';
import { HealthService } from './health.service';

@ApiTags('health')
@Controller('health')
export class HealthController {
  constructor(private readonly health: HealthService) {}

  @Public()
  @Get()
  @ApiOperation({ summary: 'Liveness and database reachability' })
  @ApiServiceUnavailableResponse({ description: 'The database cannot be reached' })
  async check(@Res({ passthrough: true }) res: Response): Promise<HealthStatus> {
    const status = await this.health.check();
    res.status(status.status === 'ok' ? HttpStatus.OK : HttpStatus.SERVICE_UNAVAILABLE);
    return status;
  }
}
