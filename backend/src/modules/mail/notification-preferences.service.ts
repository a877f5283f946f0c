import { NOTIFICATION_KINDS, type NotificationKind, type NotificationSettings } from '@dialsheet/common';
import { Injectable, Logger } from '@nestjs/common';
import { InjectDataSource } from '@nestjs/typeorm';
import { DataSource, type EntityManager } from 'typeorm';

/**
 * Each person's choice of which notification e-mails to get. Kept beside the mail service so
 * every sender (sheet assignment, passes, releases) asks the same place. Only switched kinds are
 * stored; a kind without a row is on, because who gets a kind at all is decided by role
 * (NOTIFICATION_AUDIENCE) and the switch only lets a person opt out (or back in).
 */
@Injectable()
export class NotificationPreferences {
  private readonly logger = new Logger(NotificationPreferences.name);

  constructor(@InjectDataSource() private readonly dataSource: DataSource) {}

  async get(userId: string, manager: EntityManager = this.dataSource.manager): Promise<NotificationSettings> {
    const rows = (await manager.query('SELECT kind, enabled FROM notification_settings WHERE user_id = $1', [userId])) as Array<{
      kind: NotificationKind;
      enabled: boolean;
    }>;
    const settings = Object.fromEntries(NOTIFICATION_KINDS.map((k) => [k, true])) as NotificationSettings;
    for (const row of rows) if (NOTIFICATION_KINDS.includes(row.kind)) settings[row.kind] = row.enabled;
    return settings;
  }

  async set(manager: EntityManager, userId: string, changes: Partial<NotificationSettings>): Promise<void> {
    for (const kind of NOTIFICATION_KINDS) {
      const enabled = changes[kind];
      if (typeof enabled !== 'boolean') continue;
      await manager.query(
        `INSERT INTO notification_settings (user_id, kind, enabled) VALUES ($1, $2, $3)
         ON CONFLICT (user_id, kind) DO UPDATE SET enabled = EXCLUDED.enabled, updated_at = now()`,
        [userId, kind, enabled],
      );
    }
  }

  /**
   * The subset of `userIds` who have not switched `kind` off. Called after a change committed, so
   * it never throws: when the choices cannot be read, nobody is mailed (a missed mail is better
   * than one somebody asked not to get) and the error is logged.
   */
  async wanting(kind: NotificationKind, userIds: readonly string[]): Promise<Set<string>> {
    if (userIds.length === 0) return new Set();
    let off: Array<{ user_id: string }>;
    try {
      off = (await this.dataSource.query(
        'SELECT user_id FROM notification_settings WHERE kind = $1 AND enabled = false AND user_id = ANY($2::uuid[])',
        [kind, userIds],
      )) as Array<{ user_id: string }>;
    } catch (error) {
      this.logger.error(`Could not read notification settings for ${kind}: ${String(error)}`);
      return new Set();
    }
    const refused = new Set(off.map((r) => r.user_id));
    return new Set(userIds.filter((id) => !refused.has(id)));
  }
}
