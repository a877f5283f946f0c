import { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Resolutions: the agreed value of a cell where the two passes differ, with the reason, one per
 * sheet row and channel. The passes themselves are never overwritten.
 *
 * Runs also get the columns of the release lock: once a release holds a run's data, nothing on it
 * may change. The releases themselves arrive later; until then the columns stay empty.
 */
export class Resolutions1765400000000 implements MigrationInterface {
  name = 'Resolutions1765400000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE resolutions (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        sheet_id uuid NOT NULL REFERENCES sheets (id) ON DELETE CASCADE,
        row_index integer NOT NULL,
        channel_id uuid NOT NULL REFERENCES channels (id),
        raw_text text NOT NULL,
        value double precision,
        canonical text,
        flag text,
        reason text NOT NULL,
        resolved_by uuid NOT NULL REFERENCES users (id),
        version integer NOT NULL DEFAULT 1,
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT resolutions_cell_key UNIQUE (sheet_id, row_index, channel_id),
        CONSTRAINT resolutions_row_check CHECK (row_index >= 0),
        CONSTRAINT resolutions_flag_check CHECK (flag IS NULL OR flag IN ('blank', 'unreadable', 'ambiguous')),
        CONSTRAINT resolutions_value_or_flag_check CHECK ((value IS NULL) <> (flag IS NULL)),
        CONSTRAINT resolutions_reason_check CHECK (length(btrim(reason)) > 0),
        CONSTRAINT resolutions_version_check CHECK (version >= 1)
      )`);
    await q.query(`CREATE INDEX resolutions_channel_idx ON resolutions (channel_id)`);
    await q.query(`CREATE INDEX resolutions_resolved_by_idx ON resolutions (resolved_by)`);
    await q.query(`
      ALTER TABLE runs
        ADD COLUMN locked_release_id uuid,
        ADD COLUMN locked_release_number integer,
        ADD CONSTRAINT runs_lock_check CHECK ((locked_release_id IS NULL) = (locked_release_number IS NULL))`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE runs DROP CONSTRAINT runs_lock_check, DROP COLUMN locked_release_number, DROP COLUMN locked_release_id`);
    await q.query(`DROP TABLE resolutions`);
  }
}
