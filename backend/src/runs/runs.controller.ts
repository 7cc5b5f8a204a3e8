import { Controller, Get, Headers, HttpCode, Param, Post, Query, Res, Sse } from '@nestjs/common';
import type { Response } from 'express';
import { csvLine } from '../common/csv';
import { ApiBearerAuth, ApiOperation, ApiTags } from '@nestjs/swagger';
import type { Observable } from 'rxjs';
import { idParamSchema, metricsQuerySchema, runSearchQuerySchema, type Page, type RunSearchQuery, type CheckpointInfo, type MetricSample, type MetricsQuery, type Run } from '@kiln/shared';
import { CurrentUser, Public } from '../auth/auth.decorators';
import type { AuthenticatedUser } from '../auth/authenticated-user';
import { ZodValidationPipe } from '../common/zod-validation.pipe';
import { RunsService } from './runs.service';

const id = new ZodValidationPipe(idParamSchema);

@ApiTags('runs')
@ApiBearerAuth()
@Controller('runs')
export class RunsController {
  constructor(private readonly runs: RunsService) {}

  @Get()
  @ApiOperation({ summary: 'Runs the caller can see across studies (scope=mine: their own), filtered, sorted, paged' })
  search(@CurrentUser() user: AuthenticatedUser, @Query(new ZodValidationPipe(runSearchQuerySchema)) query: RunSearchQuery): Promise<Page<Run>> {
    return this.runs.search(user, query);
  }

  @Get(':id')
  @ApiOperation({ summary: 'A run: spec, state, wait reason, outcome, progress, parent checkpoint' })
  get(@CurrentUser() user: AuthenticatedUser, @Param('id', id) runId: string): Promise<Run> {
    return this.runs.get(user, runId);
  }

  @Get(':id/metrics')
  @ApiOperation({ summary: 'Sampled diagnostics after step `from` (incremental reads)' })
  metrics(
    @CurrentUser() user: AuthenticatedUser,
    @Param('id', id) runId: string,
    @Query(new ZodValidationPipe(metricsQuerySchema)) query: MetricsQuery,
  ): Promise<MetricSample[]> {
    return this.runs.metrics(user, runId, query);
  }

  @Get(':id/metrics.csv')
  @ApiOperation({ summary: "The run's sampled diagnostics as CSV" })
  async metricsCsv(@CurrentUser() user: AuthenticatedUser, @Param('id', id) runId: string, @Res({ passthrough: true }) response: Response): Promise<string> {
    const samples = await this.runs.metrics(user, runId, { from: -1, limit: 1_000_000 });
    response.setHeader('Content-Type', 'text/csv; charset=utf-8');
    response.setHeader('Content-Disposition', `attachment; filename="kiln-run-${runId}-metrics.csv"`);
    const columns = ['step', 't', 'dt', 'energy', 'tension', 'gradMax', 'gradMaxAt', 'lambda', 'center', 'sigma', 'sigmaDenominator', 'points', 'newtonIterations'] as const;
    return csvLine([...columns]) + samples.map((sample) => csvLine(columns.map((c) => sample[c]))).join('');
  }

  @Get(':id/checkpoints')
  @ApiOperation({ summary: "The run's checkpoints, oldest first" })
  checkpoints(@CurrentUser() user: AuthenticatedUser, @Param('id', id) runId: string): Promise<CheckpointInfo[]> {
    return this.runs.checkpoints(user, runId);
  }

  @Post(':id/pause')
  @HttpCode(202)
  @ApiOperation({ summary: 'Pause: the holder checkpoints and releases the slot' })
  pause(@CurrentUser() user: AuthenticatedUser, @Param('id', id) runId: string): Promise<Run> {
    return this.runs.pause(user, runId);
  }

  @Post(':id/cancel')
  @HttpCode(202)
  @ApiOperation({ summary: 'Cancel: the holder checkpoints and stops; the slot is freed' })
  cancel(@CurrentUser() user: AuthenticatedUser, @Param('id', id) runId: string): Promise<Run> {
    return this.runs.cancel(user, runId);
  }

  @Post(':id/resume')
  @HttpCode(202)
  @ApiOperation({ summary: 'Resume a paused, cancelled, failed or time-limited run from its latest checkpoint' })
  resume(@CurrentUser() user: AuthenticatedUser, @Param('id', id) runId: string): Promise<Run> {
    return this.runs.resume(user, runId);
  }

  @Post(':id/events/ticket')
  @HttpCode(200)
  @ApiOperation({ summary: 'A short-lived ticket to open the live stream from a browser' })
  ticket(@CurrentUser() user: AuthenticatedUser, @Param('id', id) runId: string): Promise<{ ticket: string; expiresIn: number }> {
    return this.runs.eventTicket(user, runId);
  }

  @Public()
  @Sse(':id/events')
  @ApiOperation({ summary: 'Live events (server-sent): state, progress, checkpoints. Authenticate with ?ticket= or a bearer header' })
  async events(
    @Param('id', id) runId: string,
    @Query('ticket') ticket: string | undefined,
    @Headers('authorization') authorization: string | undefined,
  ): Promise<Observable<{ data: unknown }>> {
    const user = await this.runs.authenticateStream(runId, ticket, authorization);
    return this.runs.stream(user, runId);
  }
}
