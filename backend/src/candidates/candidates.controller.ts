import { Body, Controller, Get, HttpCode, Param, Post, Query } from '@nestjs/common';
import { ApiBearerAuth, ApiBody, ApiOperation, ApiTags } from '@nestjs/swagger';
import { candidateListQuerySchema, idParamSchema, verdictSchema, type CandidateListQuery, type VerdictRequest } from '@kiln/shared';
import { CurrentUser } from '../auth/auth.decorators';
import type { AuthenticatedUser } from '../auth/authenticated-user';
import { openApiSchema } from '../common/openapi';
import { ZodValidationPipe } from '../common/zod-validation.pipe';
import { CandidatesService } from './candidates.service';

const id = new ZodValidationPipe(idParamSchema);

@ApiTags('candidates')
@ApiBearerAuth()
@Controller('candidates')
export class CandidatesController {
  constructor(private readonly candidates: CandidatesService) {}

  @Get()
  @ApiOperation({ summary: 'Possible singularities the caller can see: filter by study, sweep, kind, verdict; sort by confidence or T̂' })
  list(@CurrentUser() user: AuthenticatedUser, @Query(new ZodValidationPipe(candidateListQuerySchema)) query: CandidateListQuery) {
    return this.candidates.list(user, query);
  }

  @Get(':id')
  @ApiOperation({ summary: 'A candidate with its evidence and the comparison with its finer run' })
  get(@CurrentUser() user: AuthenticatedUser, @Param('id', id) candidateId: string) {
    return this.candidates.get(user, candidateId);
  }

  @Get(':id/plots')
  @ApiOperation({ summary: 'Data for the evidence plots: max|∇u| against T̂ − t, rescaled profiles, history' })
  plots(@CurrentUser() user: AuthenticatedUser, @Param('id', id) candidateId: string) {
    return this.candidates.plots(user, candidateId);
  }

  @Post(':id/verdict')
  @HttpCode(200)
  @ApiOperation({ summary: 'Record a verdict (confirmed, artefact, needs-finer-run) with a note; audited' })
  @ApiBody({ schema: openApiSchema(verdictSchema) })
  verdict(@CurrentUser() user: AuthenticatedUser, @Param('id', id) candidateId: string, @Body(new ZodValidationPipe(verdictSchema)) body: VerdictRequest) {
    return this.candidates.verdict(user, candidateId, body);
  }

  @Post(':id/fork-finer')
  @ApiOperation({ summary: 'Fork a finer run (2× grid, 10× tighter tolerance) from the checkpoint before the indicators fired' })
  forkFiner(@CurrentUser() user: AuthenticatedUser, @Param('id', id) candidateId: string) {
    return this.candidates.forkFiner(user, candidateId);
  }
}
