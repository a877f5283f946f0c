import { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Accounts, campaigns, membership, invitations, password resets, signed-out tokens and the
 * append-only audit trail. Written by hand; gen_random_uuid() is built into PostgreSQL 13+.
 */
export class Foundation1764640800000 implements MigrationInterface {
  name = 'Foundation1764640800000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE users (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        email text NOT NULL,
        name text NOT NULL,
        password_hash text NOT NULL,
        is_admin boolean NOT NULL DEFAULT false,
        disabled_at timestamptz,
        token_version integer NOT NULL DEFAULT 0,
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT users_email_key UNIQUE (email),
        CONSTRAINT users_email_lower_check CHECK (email = lower(email))
      )`);

    await q.query(`
      CREATE TABLE campaigns (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        name text NOT NULL,
        description text NOT NULL DEFAULT '',
        decimal_comma boolean NOT NULL DEFAULT false,
        status text NOT NULL DEFAULT 'active',
        archived_at timestamptz,
        created_by_id uuid NOT NULL REFERENCES users (id),
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT campaigns_status_check CHECK (status IN ('active', 'archived')),
        CONSTRAINT campaigns_name_check CHECK (length(btrim(name)) > 0)
      )`);
    await q.query(`CREATE INDEX campaigns_name_idx ON campaigns (name)`);

    // Roles as text[]: one person may hold several roles; the check keeps the array non-empty,
    // free of unknown roles, so "who is lead" stays a simple `'lead' = ANY(roles)`.
    await q.query(`
      CREATE TABLE campaign_members (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        campaign_id uuid NOT NULL REFERENCES campaigns (id),
        user_id uuid NOT NULL REFERENCES users (id),
        roles text[] NOT NULL,
        joined_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT campaign_members_campaign_user_key UNIQUE (campaign_id, user_id),
        CONSTRAINT campaign_members_roles_check CHECK (
          cardinality(roles) > 0 AND roles <@ ARRAY['reader', 'checker', 'engineer', 'lead']::text[]
        )
      )`);
    await q.query(`CREATE INDEX campaign_members_user_idx ON campaign_members (user_id)`);

    await q.query(`
      CREATE TABLE invitations (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        campaign_id uuid NOT NULL REFERENCES campaigns (id),
        email text NOT NULL,
        roles text[] NOT NULL,
        token_hash text NOT NULL,
        invited_by_id uuid NOT NULL REFERENCES users (id),
        expires_at timestamptz NOT NULL,
        accepted_at timestamptz,
        accepted_by_id uuid REFERENCES users (id),
        revoked_at timestamptz,
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT invitations_token_hash_key UNIQUE (token_hash),
        CONSTRAINT invitations_email_lower_check CHECK (email = lower(email)),
        CONSTRAINT invitations_roles_check CHECK (
          cardinality(roles) > 0 AND roles <@ ARRAY['reader', 'checker', 'engineer', 'lead']::text[]
        )
      )`);
    await q.query(`CREATE INDEX invitations_campaign_idx ON invitations (campaign_id, created_at DESC)`);

    await q.query(`
      CREATE TABLE password_resets (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        user_id uuid NOT NULL REFERENCES users (id),
        token_hash text NOT NULL,
        expires_at timestamptz NOT NULL,
        used_at timestamptz,
        created_at timestamptz NOT NULL DEFAULT now(),
        updated_at timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT password_resets_token_hash_key UNIQUE (token_hash)
      )`);
    await q.query(`CREATE INDEX password_resets_user_idx ON password_resets (user_id)`);

    await q.query(`
      CREATE TABLE revoked_tokens (
        jti uuid PRIMARY KEY,
        user_id uuid NOT NULL REFERENCES users (id),
        expires_at timestamptz NOT NULL,
        created_at timestamptz NOT NULL DEFAULT now()
      )`);
    await q.query(`CREATE INDEX revoked_tokens_expires_idx ON revoked_tokens (expires_at)`);

    // seq gives a gap-tolerant total order that survives equal timestamps within a transaction.
    await q.query(`
      CREATE TABLE audit_entries (
        id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        seq bigserial NOT NULL,
        campaign_id uuid REFERENCES campaigns (id),
        actor_id uuid REFERENCES users (id),
        entity_type text NOT NULL,
        entity_id uuid NOT NULL,
        action text NOT NULL,
        before jsonb,
        after jsonb,
        reason text,
        created_at timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT audit_entries_seq_key UNIQUE (seq)
      )`);
    await q.query(`CREATE INDEX audit_entries_campaign_seq_idx ON audit_entries (campaign_id, seq DESC)`);

    // The trail must stay append-only even for someone with SQL access, not only through the API.
    await q.query(`
      CREATE FUNCTION audit_entries_reject_change() RETURNS trigger
      LANGUAGE plpgsql AS $$
      BEGIN
        RAISE EXCEPTION 'audit_entries is append-only: % is not allowed', TG_OP
          USING ERRCODE = 'insufficient_privilege';
      END
      $$`);
    await q.query(`
      CREATE TRIGGER audit_entries_append_only
      BEFORE UPDATE OR DELETE ON audit_entries
      FOR EACH ROW EXECUTE FUNCTION audit_entries_reject_change()`);
    await q.query(`
      CREATE TRIGGER audit_entries_no_truncate
      BEFORE TRUNCATE ON audit_entries
      FOR EACH STATEMENT EXECUTE FUNCTION audit_entries_reject_change()`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE audit_entries`);
    await q.query(`DROP FUNCTION audit_entries_reject_change()`);
    await q.query(`DROP TABLE revoked_tokens`);
    await q.query(`DROP TABLE password_resets`);
    await q.query(`DROP TABLE invitations`);
    await q.query(`DROP TABLE campaign_members`);
    await q.query(`DROP TABLE campaigns`);
    await q.query(`DROP TABLE users`);
  }
}
