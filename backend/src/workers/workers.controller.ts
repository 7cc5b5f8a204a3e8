import { Controller, Get } from '@nestjs/common';
import { ApiBearerAuth, ApiOperation, ApiTags } from '@nestjs/swagger';
import type { WorkerInfo } from '@kiln/shared';
import { WorkersService } from './workers.service';

@ApiTags('workers')
@ApiBearerAuth()
@Controller('workers')
export class WorkersController {
  constructor(private readonly workers: WorkersService) {}

  @Get()
  @ApiOperation({ summary: 'Worker processes: host, pid, slots, last heartbeat, stale flag, runs held' })
  list(): Promise<WorkerInfo[]> {
    return this.workers.list();
  }
}
