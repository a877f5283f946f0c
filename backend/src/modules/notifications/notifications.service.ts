import { type NotificationSettings } from '@dialsheet/common';
import { Injectable, Logger } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource } from 'typeorm';
import type { AuthUser } from '../../core/auth-user';
import { MailService } from '../mail/mail.service';
import { NotificationPreferences } from '../mail/notification-preferences.service';
import { MISMATCH_SQL } from '../exports/snapshot';

interface Person {
  id: string;
  email: string;
  name: string;
}

interface SheetContext {
  sheetId: string;
  sheetName: string;
  campaignId: string;
  campaignName: string;
  runName: string;
  checkerId: string | null;
  pass1Finished: boolean;
  pass2Finished: boolean;
}

/**
 * The notification mails of the lead's part. Every method here runs after the change it tells
 * about has committed and never throws: a mail server that is down must not turn a finished pass
 * or a signed release into an error (it is logged, and the screens show the state anyway).
 */
@Injectable()
export class NotificationsService {
  private readonly logger = new Logger(NotificationsService.name);
  /** Pass finishes already told of (per process; a repeated finish call would otherwise mail again). */
  private readonly told = new Set<string>();

  constructor(
    @InjectDataSource() private readonly dataSource: DataSource,
    private readonly mail: MailService,
    private readonly preferences: NotificationPreferences,
  ) {}

  settings(user: AuthUser): Promise<NotificationSettings> {
    return this.preferences.get(user.id);
  }

  async updateSettings(user: AuthUser, changes: Partial<NotificationSettings>): Promise<NotificationSettings> {
    return this.dataSource.transaction(async (manager) => {
      await this.preferences.set(manager, user.id, changes);
      return this.preferences.get(user.id, manager);
    });
  }

  /**
   * A pass of a sheet was finished by `finisher`: its leads and engineers hear of it; once both
   * passes are in and some cells differ, the sheet's checker and the leads hear that mismatches
   * wait (not before: the checker must not learn of pass 1 while typing pass 2).
   */
  async passFinished(finish: { sheetId: string; pass: 1 | 2; finishedAt: string }, finisher: { id: string; name: string }): Promise<void> {
    const { sheetId, pass } = finish;
    // Finishing an already finished pass answers with the stored time: the same event, told once.
    const event = `${sheetId}:${pass}:${finish.finishedAt}`;
    if (this.told.has(event)) return;
    this.told.add(event);
    if (this.told.size > 10_000) this.told.delete(this.told.values().next().value as string);
    try {
      const ctx = await this.sheetContext(sheetId);
      if (!ctx) return;
      const overseers = (await this.members(ctx.campaignId, ['lead', 'engineer'])).filter((p) => p.id !== finisher.id);
      await this.send('pass-finished', overseers, (p) =>
        this.mail.sendPassFinished(p.email, {
          campaignId: ctx.campaignId,
          sheetId: ctx.sheetId,
          name: p.name,
          finisherName: finisher.name,
          pass,
          sheetName: ctx.sheetName,
          runName: ctx.runName,
          campaignName: ctx.campaignName,
        }),
      );
      if (!(ctx.pass1Finished && ctx.pass2Finished)) return;
      const count = await this.openMismatches(sheetId);
      if (count === 0) return;
      const people = await this.members(ctx.campaignId, ['lead']);
      if (ctx.checkerId && !people.some((p) => p.id === ctx.checkerId)) {
        const [checker] = (await this.dataSource.query('SELECT id, email, name FROM users WHERE id = $1 AND disabled_at IS NULL', [
          ctx.checkerId,
        ])) as Person[];
        if (checker) people.push(checker);
      }
      await this.send('mismatches-waiting', people, (p) =>
        this.mail.sendMismatchesWaiting(p.email, {
          campaignId: ctx.campaignId,
          sheetId: ctx.sheetId,
          name: p.name,
          count,
          sheetName: ctx.sheetName,
          runName: ctx.runName,
          campaignName: ctx.campaignName,
        }),
      );
    } catch (error) {
      this.logger.error(`Pass-finished notifications for sheet ${sheetId} failed: ${String(error)}`);
    }
  }

  /** A release was signed: every member of its campaign hears of it (unless switched off). */
  async releasePublished(releaseId: string): Promise<void> {
    try {
      const [release] = (await this.dataSource.query(
        `SELECT r.id, r.campaign_id, r.number, r.title, r.content_hash, c.name AS campaign_name, u.name AS signer_name,
                array(SELECT ru.name FROM runs ru WHERE ru.id = ANY(r.run_ids) ORDER BY ru.name) AS run_names
           FROM releases r JOIN campaigns c ON c.id = r.campaign_id JOIN users u ON u.id = r.signed_by
          WHERE r.id = $1 AND r.status = 'published'`,
        [releaseId],
      )) as Array<{
        id: string;
        campaign_id: string;
        number: number;
        title: string;
        content_hash: string;
        campaign_name: string;
        signer_name: string;
        run_names: string[];
      }>;
      if (!release) return;
      const everyone = await this.members(release.campaign_id, []);
      await this.send('release-published', everyone, (p) =>
        this.mail.sendReleasePublished(p.email, {
          campaignId: release.campaign_id,
          releaseId: release.id,
          name: p.name,
          number: release.number,
          title: release.title,
          signerName: release.signer_name,
          campaignName: release.campaign_name,
          runNames: release.run_names,
          contentHash: release.content_hash,
        }),
      );
    } catch (error) {
      this.logger.error(`Release-published notifications for release ${releaseId} failed: ${String(error)}`);
    }
  }

  private async send(kind: Parameters<NotificationPreferences['wanting']>[0], people: Person[], deliver: (p: Person) => Promise<void>): Promise<void> {
    const wanting = await this.preferences.wanting(kind, people.map((p) => p.id));
    for (const person of people) {
      if (!wanting.has(person.id)) continue;
      try {
        await deliver(person);
      } catch (error) {
        this.logger.error(`${kind} mail to ${person.email} failed: ${String(error)}`);
      }
    }
  }

  /** Active members holding any of `roles` (every member when empty). */
  private async members(campaignId: string, roles: readonly string[]): Promise<Person[]> {
    return (await this.dataSource.query(
      `SELECT u.id, u.email, u.name FROM campaign_members m JOIN users u ON u.id = m.user_id
        WHERE m.campaign_id = $1 AND u.disabled_at IS NULL AND (cardinality($2::text[]) = 0 OR m.roles && $2::text[])
        ORDER BY u.name, u.id`,
      [campaignId, roles],
    )) as Person[];
  }

  private async sheetContext(sheetId: string): Promise<SheetContext | null> {
    const [row] = (await this.dataSource.query(
      `SELECT s.id AS "sheetId", s.name AS "sheetName", s.campaign_id AS "campaignId", c.name AS "campaignName", r.name AS "runName",
              s.checker_id AS "checkerId", s.pass1_finished_at IS NOT NULL AS "pass1Finished", s.pass2_finished_at IS NOT NULL AS "pass2Finished"
         FROM sheets s JOIN runs r ON r.id = s.run_id JOIN campaigns c ON c.id = s.campaign_id
        WHERE s.id = $1`,
      [sheetId],
    )) as SheetContext[];
    return row ?? null;
  }

  private async openMismatches(sheetId: string): Promise<number> {
    const [{ n }] = (await this.dataSource.query(
      `SELECT count(*)::int AS n
         FROM readings r1
         JOIN sheet_channels sc ON sc.sheet_id = r1.sheet_id AND sc.channel_id = r1.channel_id
         JOIN readings r2 ON r2.sheet_id = r1.sheet_id AND r2.row_index = r1.row_index AND r2.channel_id = r1.channel_id AND r2.pass = 2
         LEFT JOIN resolutions res ON res.sheet_id = r1.sheet_id AND res.row_index = r1.row_index AND res.channel_id = r1.channel_id
        WHERE r1.sheet_id = $1 AND r1.pass = 1 AND res.id IS NULL AND ${MISMATCH_SQL}`,
      [sheetId],
    )) as Array<{ n: number }>;
    return n;
  }
}
