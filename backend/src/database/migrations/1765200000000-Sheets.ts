import { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Sheets (reading plans of a run) and their ordered channels. The channel link has no cascade,
 * so a channel that a sheet reads cannot be deleted from under it.
 */
export class Sheets1765200000000 implements MigrationInterface {
  name = 'Sheets1765200000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE sheets (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        campaign_id uuid NOT NULL REFERENCES campaigns (id),
        run_id uuid NOT NULL REFERENCES runs (id) ON DELETE CASCADE,
        name text NOT NULL,
        start_time float8 NOT NULL,
        end_time float8 NOT NULL,
        interval float8 NOT NULL,
        reader_id uuid REFERENCES users (id),
        checker_id uuid REFERENCES users (id),
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT sheets_name_check CHECK (length(btrim(name)) > 0),
        CONSTRAINT sheets_start_check CHECK (start_time >= 0),
        CONSTRAINT sheets_end_check CHECK (end_time > start_time),
        CONSTRAINT sheets_interval_check CHECK (interval >= 0.1),
        CONSTRAINT sheets_people_check CHECK (reader_id IS NULL OR checker_id IS NULL OR reader_id <> checker_id)
      )`);
    await q.query(`CREATE INDEX sheets_run_idx ON sheets (run_id)`);

    await q.query(`
      CREATE TABLE sheet_channels (
        sheet_id uuid NOT NULL REFERENCES sheets (id) ON DELETE CASCADE,
        channel_id uuid NOT NULL REFERENCES channels (id),
        position integer NOT NULL,
        PRIMARY KEY (sheet_id, channel_id),
        CONSTRAINT sheet_channels_position_check CHECK (position >= 0),
        CONSTRAINT sheet_channels_sheet_position_key UNIQUE (sheet_id, position) DEFERRABLE INITIALLY DEFERRED
      )`);
    await q.query(`CREATE INDEX sheet_channels_channel_idx ON sheet_channels (channel_id)`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE sheet_channels`);
    await q.query(`DROP TABLE sheets`);
  }
}
