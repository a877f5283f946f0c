import 'reflect-metadata';
import { randomUUID } from 'node:crypto';
import { DataSource } from 'typeorm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildDataSourceOptions } from '../../src/database/data-source-options';
import { testDatabaseUrl } from '../helpers/test-app';

describe('audit_entries is append-only in the database itself', () => {
  let db: DataSource;
  let id: string;

  beforeAll(async () => {
    db = await new DataSource(buildDataSourceOptions(testDatabaseUrl())).initialize();
    const rows: Array<{ id: string }> = await db.query(
      `INSERT INTO audit_entries (entity_type, entity_id, action, after) VALUES ('campaign', $1, 'create', '{"name":"x"}') RETURNING id`,
      [randomUUID()],
    );
    id = rows[0].id;
  });
  afterAll(() => db.destroy());

  it.each([
    ['UPDATE', `UPDATE audit_entries SET reason = 'edited' WHERE id = $1`],
    ['DELETE', `DELETE FROM audit_entries WHERE id = $1`],
  ])('rejects %s', async (op, sql) => {
    await expect(db.query(sql, [id])).rejects.toThrow(`audit_entries is append-only: ${op} is not allowed`);
    const rows: Array<{ reason: string | null }> = await db.query('SELECT reason FROM audit_entries WHERE id = $1', [id]);
    expect(rows).toEqual([{ reason: null }]);
  });

  it('rejects TRUNCATE', async () => {
    await expect(db.query('TRUNCATE audit_entries CASCADE')).rejects.toThrow('append-only: TRUNCATE is not allowed');
    const [{ count }] = await db.query('SELECT count(*)::int AS count FROM audit_entries WHERE id = $1', [id]);
    expect(count).toBe(1);
  });

  it('still accepts new rows, numbered in order', async () => {
    const a = await db.query(`INSERT INTO audit_entries (entity_type, entity_id, action) VALUES ('member', $1, 'join') RETURNING seq`, [randomUUID()]);
    const b = await db.query(`INSERT INTO audit_entries (entity_type, entity_id, action) VALUES ('member', $1, 'join') RETURNING seq`, [randomUUID()]);
    expect(Number(b[0].seq)).toBeGreaterThan(Number(a[0].seq));
  });
});
