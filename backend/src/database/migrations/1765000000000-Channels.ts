import { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Channels (instrument displays) of a campaign and, per run, the region of the frame where each
 * display sits. Written by hand, like the earlier migrations.
 */
export class Channels1765000000000 implements MigrationInterface {
  name = 'Channels1765000000000';

  async up(q: QueryRunner): Promise<void> {
    // Positions are unique per campaign but checked at commit, so a reorder can swap them freely.
    await q.query(`
      CREATE TABLE channels (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        campaign_id uuid NOT NULL REFERENCES campaigns (id),
        name text NOT NULL,
        symbol text NOT NULL,
        quantity text NOT NULL,
        raw_unit text NOT NULL,
        resolution float8 NOT NULL,
        range_min float8 NOT NULL,
        range_max float8 NOT NULL,
        full_scale float8,
        operating_min float8,
        operating_max float8,
        accuracy jsonb,
        plausible_min float8,
        plausible_max float8,
        position integer NOT NULL,
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT channels_name_check CHECK (length(btrim(name)) > 0),
        CONSTRAINT channels_resolution_check CHECK (resolution > 0),
        CONSTRAINT channels_range_check CHECK (range_min < range_max),
        CONSTRAINT channels_full_scale_check CHECK (full_scale IS NULL OR full_scale > 0),
        CONSTRAINT channels_operating_check CHECK (operating_min IS NULL OR operating_max IS NULL OR operating_min < operating_max),
        CONSTRAINT channels_plausible_check CHECK (plausible_min IS NULL OR plausible_max IS NULL OR plausible_min < plausible_max),
        CONSTRAINT channels_position_check CHECK (position >= 0),
        CONSTRAINT channels_campaign_position_key UNIQUE (campaign_id, position) DEFERRABLE INITIALLY DEFERRED
      )`);
    await q.query(`CREATE UNIQUE INDEX channels_campaign_name_key ON channels (campaign_id, lower(name))`);

    await q.query(`
      CREATE TABLE display_regions (
        run_id uuid NOT NULL REFERENCES runs (id) ON DELETE CASCADE,
        channel_id uuid NOT NULL REFERENCES channels (id) ON DELETE CASCADE,
        x float8 NOT NULL,
        y float8 NOT NULL,
        width float8 NOT NULL,
        height float8 NOT NULL,
        PRIMARY KEY (run_id, channel_id),
        CONSTRAINT display_regions_origin_check CHECK (x >= 0 AND y >= 0),
        CONSTRAINT display_regions_size_check CHECK (width > 0 AND height > 0),
        CONSTRAINT display_regions_extent_check CHECK (x + width <= 1.000001 AND y + height <= 1.000001)
      )`);
    await q.query(`CREATE INDEX display_regions_channel_idx ON display_regions (channel_id)`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE display_regions`);
    await q.query(`DROP TABLE channels`);
  }
}
