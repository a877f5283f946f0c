import { BeforeApplicationShutdown, Injectable, Logger, OnApplicationBootstrap } from '@nestjs/common';
import PgBoss from 'pg-boss';
import type { EntityManager } from 'typeorm';
import { AppConfig } from '../config/app-config';

/** pg-boss keeps its tables in their own schema, next to ours in the same database. */
export const JOBS_SCHEMA = 'pgboss';

export interface QueueSettings {
  /** Further attempts after the first failure. */
  retryLimit: number;
  retryDelaySeconds: number;
  /** An attempt running longer than this is failed (and retried if attempts remain). */
  expireInSeconds: number;
}

export type JobHandler<T> = (job: PgBoss.JobWithMetadata<T>) => Promise<void>;

interface Registration {
  settings: QueueSettings;
  handler?: JobHandler<object>;
  /** Called once the worker for this queue runs (e.g. to pick up work a dead process left). */
  onWorkerStart?: () => Promise<void>;
  workerId?: string;
  /** pg-boss cron expression: the queue gets a job on this schedule (minute resolution). */
  cron?: string;
}

export interface SendOptions {
  /** Insert the job inside this transaction, so it exists exactly when the transaction commits. */
  manager?: EntityManager;
  startAfterSeconds?: number;
}

/**
 * The PostgreSQL-backed job queue (pg-boss 10). Every process starts it, so any process can
 * enqueue; only processes with WORKER=on (the API by default, and cli/worker.ts) take jobs.
 * Queues and their handlers are declared by feature modules in onModuleInit.
 */
@Injectable()
export class JobsService implements OnApplicationBootstrap, BeforeApplicationShutdown {
  private readonly logger = new Logger('Jobs');
  private readonly queues = new Map<string, Registration>();
  private readonly stopping = new AbortController();
  private boss: PgBoss | null = null;

  constructor(private readonly config: AppConfig) {}

  /** Aborted when the process begins to shut down; long work listens and stops early. */
  get shutdownSignal(): AbortSignal {
    return this.stopping.signal;
  }

  get workerEnabled(): boolean {
    return this.config.worker;
  }

  defineQueue(name: string, settings: QueueSettings): void {
    if (this.boss) throw new Error(`queue ${name} must be defined before the application starts`);
    this.queues.set(name, { ...this.queues.get(name), settings });
  }

  /**
   * Sends a job to the queue on a cron schedule. pg-boss keeps schedules in its tables and
   * enqueues at most one job per tick across all processes, so several API processes do not
   * multiply the work. Only processes with the worker on keep the schedule (and its clock) alive.
   */
  defineSchedule(name: string, cron: string): void {
    const queue = this.queues.get(name);
    if (!queue) throw new Error(`define queue ${name} before its schedule`);
    if (this.boss) throw new Error(`the schedule of ${name} must be defined before the application starts`);
    queue.cron = cron;
  }

  /** Stops the schedule of a queue in every process (tests that must not be interrupted use it). */
  async unschedule(name: string): Promise<void> {
    await this.requireBoss().unschedule(name);
  }

  registerWorker<T extends object>(name: string, handler: JobHandler<T>, onWorkerStart?: () => Promise<void>): void {
    const queue = this.queues.get(name);
    if (!queue) throw new Error(`define queue ${name} before registering its worker`);
    queue.handler = handler as JobHandler<object>;
    queue.onWorkerStart = onWorkerStart;
  }

  async onApplicationBootstrap(): Promise<void> {
    const boss = new PgBoss({
      connectionString: this.config.databaseUrl,
      schema: JOBS_SCHEMA,
      application_name: 'dialsheet-jobs',
      max: 4,
      // Cron schedules run only where the worker runs (and only when a queue asks for one);
      // expiry, retries and clean-up run through supervise everywhere.
      schedule: this.config.worker && [...this.queues.values()].some((q) => q.cron !== undefined),
      supervise: true,
      migrate: true,
    });
    boss.on('error', (error: Error) => this.logger.error(`queue error: ${error.message}`));
    await boss.start();
    this.boss = boss;
    for (const [name, { settings }] of this.queues) {
      const options = {
        name,
        retryLimit: settings.retryLimit,
        retryDelay: settings.retryDelaySeconds,
        expireInSeconds: settings.expireInSeconds,
      };
      await boss.createQueue(name, options);
      // createQueue keeps an existing queue as it was; bring its settings up to date.
      await boss.updateQueue(name, options);
    }
    if (!this.config.worker) return;
    for (const [name, queue] of this.queues) {
      if (queue.cron !== undefined) await boss.schedule(name, queue.cron);
    }
    for (const [name, queue] of this.queues) {
      if (!queue.handler) continue;
      const handler = queue.handler;
      queue.workerId = await boss.work<object>(
        name,
        { includeMetadata: true, batchSize: 1, pollingIntervalSeconds: 2 },
        async ([job]) => handler(job),
      );
      this.logger.log(`worker started for ${name}`);
      if (queue.onWorkerStart) {
        await queue.onWorkerStart().catch((error: unknown) => {
          this.logger.error(`start-up of ${name} worker: ${error instanceof Error ? error.message : String(error)}`);
        });
      }
    }
  }

  async send(name: string, data: object, options: SendOptions = {}): Promise<string> {
    const boss = this.requireBoss();
    if (!this.queues.has(name)) throw new Error(`unknown queue ${name}`);
    const id = await boss.send(name, data, {
      db: options.manager ? managerDb(options.manager) : undefined,
      startAfter: options.startAfterSeconds,
    });
    if (!id) throw new Error(`the queue ${name} did not accept the job`);
    if (!options.manager) this.wake(name);
    return id;
  }

  /** Tells this process's worker to look for jobs now instead of at its next poll. */
  wake(name: string): void {
    const workerId = this.queues.get(name)?.workerId;
    if (workerId && this.boss) this.boss.notifyWorker(workerId);
  }

  async beforeApplicationShutdown(): Promise<void> {
    this.stopping.abort();
    const boss = this.boss;
    if (!boss) return;
    // Handlers see the abort, stop their tools and hand their work back (which may enqueue
    // again, so the queue stays usable until they are done); give them that long.
    await boss.stop({ graceful: true, wait: true, timeout: 15_000 });
    this.boss = null;
  }

  private requireBoss(): PgBoss {
    if (!this.boss) throw new Error('the job queue is not running');
    return this.boss;
  }
}

/** pg-boss runs its SQL through this, so a job can be inserted in the caller's transaction. */
function managerDb(manager: EntityManager): PgBoss.Db {
  return {
    async executeSql(text: string, values: unknown[]) {
      const runner = manager.queryRunner;
      if (!runner) throw new Error('a job can only join a transaction that has a query runner');
      const result = await runner.query(text, values, true);
      return { rows: result.records ?? [] };
    },
  };
}
