import { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Runs of a campaign, the recording (video) of each run with its processing state, and the
 * presentation time of every frame. Written by hand, like the foundation migration.
 */
export class Recordings1764900000000 implements MigrationInterface {
  name = 'Recordings1764900000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE runs (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        campaign_id uuid NOT NULL REFERENCES campaigns (id),
        name text NOT NULL,
        run_date date,
        configuration text NOT NULL DEFAULT '',
        operator text NOT NULL DEFAULT '',
        notes text NOT NULL DEFAULT '',
        sync jsonb,
        created_by_id uuid NOT NULL REFERENCES users (id),
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT runs_name_check CHECK (length(btrim(name)) > 0)
      )`);
    await q.query(`CREATE INDEX runs_campaign_idx ON runs (campaign_id, created_at)`);

    // campaign_id is copied from the run so that "this file is already in the campaign" is one
    // unique index, which also settles two identical uploads racing each other.
    await q.query(`
      CREATE TABLE recordings (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        run_id uuid NOT NULL REFERENCES runs (id),
        campaign_id uuid NOT NULL REFERENCES campaigns (id),
        original_name text NOT NULL,
        size_bytes bigint NOT NULL,
        sha256 text NOT NULL,
        mime_type text NOT NULL,
        status text NOT NULL DEFAULT 'uploaded',
        progress real NOT NULL DEFAULT 0,
        failure_reason text,
        probe jsonb,
        original_key text NOT NULL,
        proxy_key text,
        proxy_width integer,
        proxy_height integer,
        proxy_size_bytes bigint,
        poster_key text,
        claim_id uuid,
        heartbeat_at timestamptz,
        uploaded_by_id uuid NOT NULL REFERENCES users (id),
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT recordings_run_key UNIQUE (run_id),
        CONSTRAINT recordings_campaign_sha256_key UNIQUE (campaign_id, sha256),
        CONSTRAINT recordings_status_check CHECK (status IN ('uploaded', 'probing', 'transcoding', 'ready', 'failed')),
        CONSTRAINT recordings_progress_check CHECK (progress >= 0 AND progress <= 100),
        CONSTRAINT recordings_sha256_check CHECK (sha256 ~ '^[0-9a-f]{64}$'),
        CONSTRAINT recordings_size_check CHECK (size_bytes > 0),
        CONSTRAINT recordings_failure_check CHECK ((status = 'failed') = (failure_reason IS NOT NULL))
      )`);
    // The worker's recovery sweep looks only at recordings still in progress.
    await q.query(`
      CREATE INDEX recordings_unfinished_idx ON recordings (heartbeat_at)
      WHERE status IN ('uploaded', 'probing', 'transcoding')`);

    await q.query(`
      CREATE TABLE recording_frame_times (
        recording_id uuid PRIMARY KEY REFERENCES recordings (id) ON DELETE CASCADE,
        times float8[] NOT NULL,
        keyframe_times float8[] NOT NULL,
        updated_at timestamptz NOT NULL DEFAULT now()
      )`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE recording_frame_times`);
    await q.query(`DROP TABLE recordings`);
    await q.query(`DROP TABLE runs`);
  }
}
