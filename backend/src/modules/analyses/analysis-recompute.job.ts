import { Injectable, Logger, OnModuleInit } from '@nestjs/common';
import { JobsService, type QueueSettings } from '../../jobs/jobs.service';
import { AnalysesService } from './analyses.service';

export const ANALYSIS_RECOMPUTE_QUEUE = 'analysis-recompute';
/** pg-boss cron (minute resolution): every minute. */
export const ANALYSIS_RECOMPUTE_CRON = '* * * * *';

const SETTINGS: QueueSettings = {
  // The next minute's run retries whatever this one did not finish.
  retryLimit: 0,
  retryDelaySeconds: 30,
  expireInSeconds: 15 * 60,
};

/**
 * Stale analyses are recomputed without anyone asking: the worker runs this queue every minute
 * (computedBy null, "automatic" in the trail). A refusal is stored as status 'failed' with the old
 * result kept; nothing here throws for one analysis's sake.
 */
@Injectable()
export class AnalysisRecomputeJob implements OnModuleInit {
  private readonly logger = new Logger('AnalysisRecompute');

  constructor(
    private readonly jobs: JobsService,
    private readonly analyses: AnalysesService,
  ) {}

  onModuleInit(): void {
    this.jobs.defineQueue(ANALYSIS_RECOMPUTE_QUEUE, SETTINGS);
    this.jobs.registerWorker(ANALYSIS_RECOMPUTE_QUEUE, () => this.run());
    this.jobs.defineSchedule(ANALYSIS_RECOMPUTE_QUEUE, ANALYSIS_RECOMPUTE_CRON);
  }

  async run(): Promise<void> {
    const count = await this.analyses.recomputeStale();
    if (count > 0) this.logger.log(`recomputed ${count} stale analys${count === 1 ? 'is' : 'es'}`);
  }
}
