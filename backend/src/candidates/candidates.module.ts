import { Global, Module } from '@nestjs/common';
import { CheckpointsModule } from '../checkpoints/checkpoints.module';
import { StudiesModule } from '../studies/studies.module';
import { CandidateScannerService } from './candidate-scanner.service';
import { CandidatesController } from './candidates.controller';
import { CandidatesService } from './candidates.service';

@Global()
@Module({
  imports: [CheckpointsModule, StudiesModule],
  controllers: [CandidatesController],
  providers: [CandidatesService, CandidateScannerService],
  exports: [CandidateScannerService],
})
export class CandidatesModule {}
