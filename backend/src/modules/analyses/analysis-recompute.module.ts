import { Module } from '@nestjs/common';
import { JobsModule } from '../../jobs/jobs.module';
import { AnalysesModule } from './analyses.module';
import { AnalysisRecomputeJob } from './analysis-recompute.job';

/**
 * The recompute job on its own, so the worker process (cli/worker.ts) can run it; the API process
 * imports it too and runs it when its worker is on.
 */
@Module({
  imports: [AnalysesModule, JobsModule],
  providers: [AnalysisRecomputeJob],
  exports: [AnalysisRecomputeJob],
})
export class AnalysisRecomputeModule {}
