import { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Readings: one entry per sheet row, channel and pass, the natural key the entry screen retries
 * with. The channel link has no cascade, so a channel with readings cannot be deleted.
 */
export class Readings1765300000000 implements MigrationInterface {
  name = 'Readings1765300000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE readings (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        sheet_id uuid NOT NULL REFERENCES sheets (id) ON DELETE CASCADE,
        row_index integer NOT NULL,
        channel_id uuid NOT NULL REFERENCES channels (id),
        pass smallint NOT NULL,
        raw_text text NOT NULL,
        value double precision,
        canonical text,
        flag text,
        frame_time double precision,
        entered_by uuid NOT NULL REFERENCES users (id),
        version integer NOT NULL DEFAULT 1,
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT readings_cell_key UNIQUE (sheet_id, row_index, channel_id, pass),
        CONSTRAINT readings_row_check CHECK (row_index >= 0),
        CONSTRAINT readings_pass_check CHECK (pass IN (1, 2)),
        CONSTRAINT readings_flag_check CHECK (flag IS NULL OR flag IN ('blank', 'unreadable', 'ambiguous')),
        CONSTRAINT readings_value_or_flag_check CHECK ((value IS NULL) <> (flag IS NULL)),
        CONSTRAINT readings_version_check CHECK (version >= 1)
      )`);
    await q.query(`CREATE INDEX readings_channel_idx ON readings (channel_id)`);
    await q.query(`CREATE INDEX readings_entered_by_idx ON readings (entered_by)`);
    await q.query(`ALTER TABLE sheets ADD COLUMN pass1_finished_at timestamptz, ADD COLUMN pass2_finished_at timestamptz`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE sheets DROP COLUMN pass2_finished_at, DROP COLUMN pass1_finished_at`);
    await q.query(`DROP TABLE readings`);
  }
}
