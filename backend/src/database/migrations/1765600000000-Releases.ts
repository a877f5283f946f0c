import { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * The lead's part: releases (a numbered, immutable version of chosen runs' data with the content
 * hash of its frozen snapshot) and each person's e-mail notification choices.
 */
export class Releases1765600000000 implements MigrationInterface {
  name = 'Releases1765600000000';

  async up(q: QueryRunner): Promise<void> {
    // number, content_hash, snapshot_key and the signer exist exactly when the release is
    // published; the number is unique per campaign (NULLs of requests do not collide).
    await q.query(`
      CREATE TABLE releases (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        campaign_id uuid NOT NULL REFERENCES campaigns (id),
        number integer,
        status text NOT NULL DEFAULT 'requested',
        title text NOT NULL,
        note text NOT NULL DEFAULT '',
        run_ids uuid[] NOT NULL,
        requested_by uuid NOT NULL REFERENCES users (id),
        requested_at timestamptz NOT NULL DEFAULT now(),
        signed_by uuid REFERENCES users (id),
        signed_at timestamptz,
        decline_reason text,
        declined_by uuid REFERENCES users (id),
        content_hash text,
        reading_count integer,
        snapshot_key text,
        snapshot_bytes bigint,
        supersedes_id uuid REFERENCES releases (id),
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT releases_status_check CHECK (status IN ('requested', 'published', 'declined')),
        CONSTRAINT releases_title_check CHECK (length(btrim(title)) > 0),
        CONSTRAINT releases_runs_check CHECK (cardinality(run_ids) > 0),
        CONSTRAINT releases_number_check CHECK (number IS NULL OR number >= 1),
        CONSTRAINT releases_published_check CHECK (
          (status = 'published') = (number IS NOT NULL AND content_hash IS NOT NULL AND snapshot_key IS NOT NULL
                                    AND signed_by IS NOT NULL AND signed_at IS NOT NULL AND reading_count IS NOT NULL)),
        CONSTRAINT releases_declined_check CHECK ((status = 'declined') = (decline_reason IS NOT NULL)),
        CONSTRAINT releases_hash_check CHECK (content_hash IS NULL OR content_hash ~ '^[0-9a-f]{64}$'),
        CONSTRAINT releases_campaign_number_key UNIQUE (campaign_id, number)
      )`);
    await q.query(`CREATE INDEX releases_campaign_idx ON releases (campaign_id, requested_at DESC)`);
    await q.query(`CREATE INDEX releases_run_ids_idx ON releases USING gin (run_ids)`);
    await q.query(`CREATE INDEX releases_supersedes_idx ON releases (supersedes_id)`);
    // A published release is immutable even for someone with SQL access: its hash vouches for it.
    await q.query(`
      CREATE FUNCTION releases_reject_published_change() RETURNS trigger
      LANGUAGE plpgsql AS $$
      BEGIN
        IF OLD.status = 'published' THEN
          RAISE EXCEPTION 'release % is published and cannot be changed (%)', OLD.number, TG_OP
            USING ERRCODE = 'insufficient_privilege';
        END IF;
        RETURN CASE WHEN TG_OP = 'DELETE' THEN OLD ELSE NEW END;
      END
      $$`);
    await q.query(`
      CREATE TRIGGER releases_published_immutable
      BEFORE UPDATE OR DELETE ON releases
      FOR EACH ROW EXECUTE FUNCTION releases_reject_published_change()`);
    // The lock columns predate this table; from now on a run can only be locked by a release
    // that exists.
    await q.query(`ALTER TABLE runs ADD CONSTRAINT runs_locked_release_fkey FOREIGN KEY (locked_release_id) REFERENCES releases (id)`);
    // Only the choices a person changed are stored; a missing row means the default (on).
    await q.query(`
      CREATE TABLE notification_settings (
        user_id uuid NOT NULL REFERENCES users (id) ON DELETE CASCADE,
        kind text NOT NULL,
        enabled boolean NOT NULL,
        updated_at timestamptz NOT NULL DEFAULT now(),
        PRIMARY KEY (user_id, kind),
        CONSTRAINT notification_settings_kind_check CHECK (
          kind IN ('sheet-assigned', 'pass-finished', 'mismatches-waiting', 'release-published'))
      )`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE notification_settings`);
    await q.query(`ALTER TABLE runs DROP CONSTRAINT runs_locked_release_fkey`);
    await q.query(`DROP TABLE releases`);
    await q.query(`DROP FUNCTION releases_reject_published_change()`);
  }
}
