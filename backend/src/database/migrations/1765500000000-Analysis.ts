import { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * The engineer's part: each channel's calibration chain, derived channels, named stability rules
 * and named analyses stored with their result and a digest of the inputs they came from (so a
 * read can tell that readings, a calibration, a rule or another analysis changed since).
 */
export class Analysis1765500000000 implements MigrationInterface {
  name = 'Analysis1765500000000';

  async up(q: QueryRunner): Promise<void> {
    // One chain per channel; it goes with the channel (a channel with readings is never deleted).
    await q.query(`
      CREATE TABLE channel_calibrations (
        channel_id uuid PRIMARY KEY REFERENCES channels (id) ON DELETE CASCADE,
        chain jsonb NOT NULL,
        engineering_unit text NOT NULL,
        version integer NOT NULL DEFAULT 1,
        updated_at timestamptz NOT NULL DEFAULT now(),
        updated_by uuid REFERENCES users (id),
        CONSTRAINT channel_calibrations_unit_check CHECK (length(btrim(engineering_unit)) > 0),
        CONSTRAINT channel_calibrations_chain_check CHECK (jsonb_typeof(chain -> 'steps') = 'array'),
        CONSTRAINT channel_calibrations_version_check CHECK (version >= 1)
      )`);
    await q.query(`CREATE INDEX channel_calibrations_updated_by_idx ON channel_calibrations (updated_by)`);

    await q.query(`
      CREATE TABLE derived_channels (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        campaign_id uuid NOT NULL REFERENCES campaigns (id),
        name text NOT NULL,
        symbol text NOT NULL,
        unit text NOT NULL,
        expression text NOT NULL,
        constants jsonb NOT NULL DEFAULT '{}'::jsonb,
        inputs text[] NOT NULL DEFAULT '{}',
        version integer NOT NULL DEFAULT 1,
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT derived_channels_name_check CHECK (length(btrim(name)) > 0),
        CONSTRAINT derived_channels_symbol_check CHECK (symbol ~ '^[A-Za-z_][A-Za-z0-9_]*$'),
        CONSTRAINT derived_channels_expression_check CHECK (length(btrim(expression)) > 0),
        CONSTRAINT derived_channels_constants_check CHECK (jsonb_typeof(constants) = 'object'),
        CONSTRAINT derived_channels_version_check CHECK (version >= 1),
        CONSTRAINT derived_channels_campaign_symbol_key UNIQUE (campaign_id, symbol)
      )`);
    await q.query(`CREATE UNIQUE INDEX derived_channels_campaign_name_key ON derived_channels (campaign_id, lower(name))`);

    await q.query(`
      CREATE TABLE stability_rules (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        campaign_id uuid NOT NULL REFERENCES campaigns (id),
        channel_id uuid REFERENCES channels (id) ON DELETE CASCADE,
        name text NOT NULL,
        window_seconds float8 NOT NULL,
        slope_limit_per_minute float8,
        band_limit float8,
        drift_limit float8,
        version integer NOT NULL DEFAULT 1,
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT stability_rules_name_check CHECK (length(btrim(name)) > 0),
        CONSTRAINT stability_rules_window_check CHECK (window_seconds > 0),
        CONSTRAINT stability_rules_limits_check CHECK (
          coalesce(slope_limit_per_minute, band_limit, drift_limit) IS NOT NULL
          AND coalesce(slope_limit_per_minute, 0) >= 0 AND coalesce(band_limit, 0) >= 0 AND coalesce(drift_limit, 0) >= 0),
        CONSTRAINT stability_rules_version_check CHECK (version >= 1)
      )`);
    await q.query(`CREATE UNIQUE INDEX stability_rules_campaign_name_key ON stability_rules (campaign_id, lower(name))`);
    await q.query(`CREATE INDEX stability_rules_channel_idx ON stability_rules (channel_id)`);

    // input/result are the wire shapes (common/src/types/analysis-records.ts). uses: the analyses
    // a balance takes its streams from (a used analysis cannot be deleted); rule_id: the rule a
    // stable value is judged by (a used rule cannot be deleted). status 'stale' is never stored:
    // it is found on read by comparing inputs_digest with the data as it is now.
    await q.query(`
      CREATE TABLE analyses (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        campaign_id uuid NOT NULL REFERENCES campaigns (id),
        name text NOT NULL,
        kind text NOT NULL,
        input jsonb NOT NULL,
        result jsonb,
        status text NOT NULL DEFAULT 'current',
        error text,
        inputs_digest jsonb NOT NULL DEFAULT '{}'::jsonb,
        computed_at timestamptz,
        computed_by uuid REFERENCES users (id),
        run_ids uuid[] NOT NULL DEFAULT '{}',
        uses uuid[] NOT NULL DEFAULT '{}',
        rule_id uuid REFERENCES stability_rules (id),
        note text,
        version integer NOT NULL DEFAULT 1,
        created_by uuid NOT NULL REFERENCES users (id),
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT analyses_name_check CHECK (length(btrim(name)) > 0),
        CONSTRAINT analyses_kind_check CHECK (kind IN ('stable-value', 'balance')),
        CONSTRAINT analyses_status_check CHECK (status IN ('current', 'failed')),
        CONSTRAINT analyses_failed_check CHECK ((status = 'failed') = (error IS NOT NULL)),
        CONSTRAINT analyses_version_check CHECK (version >= 1)
      )`);
    await q.query(`CREATE UNIQUE INDEX analyses_campaign_name_key ON analyses (campaign_id, lower(name))`);
    await q.query(`CREATE INDEX analyses_run_ids_idx ON analyses USING gin (run_ids)`);
    await q.query(`CREATE INDEX analyses_uses_idx ON analyses USING gin (uses)`);
    await q.query(`CREATE INDEX analyses_rule_idx ON analyses (rule_id)`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE analyses`);
    await q.query(`DROP TABLE stability_rules`);
    await q.query(`DROP TABLE derived_channels`);
    await q.query(`DROP TABLE channel_calibrations`);
  }
}
