import { Controller, Get } from '@nestjs/common';
import { ApiOperation, ApiTags } from '@nestjs/swagger';
import type { HealthResponse } from '@kiln/shared';
import { Public } from '../auth/auth.decorators';
import { HealthService } from './health.service';

@ApiTags('health')
@Controller('health')
export class HealthController {
  constructor(private readonly health: HealthService) {}

  @Public()
  @Get()
  @ApiOperation({ summary: 'PostgreSQL, Redis and worker heartbeats; no sign-in needed' })
  check(): Promise<HealthResponse> {
    return this.health.check();
  }
}
