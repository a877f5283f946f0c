// Runs a real PostgreSQL cluster in a temporary directory: the same code path as `npm start`.
import fs from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { databaseUrl, defineCluster, destroyCluster, ensureDatabase, initCluster, isInitialised, query, runningPort, startCluster, stopCluster, type Cluster } from './postgres';
import { freePort } from './processes';

describe('embedded PostgreSQL cluster', () => {
  let base: string;
  let cluster: Cluster;

  beforeAll(async () => {
    base = fs.mkdtempSync(path.join(os.tmpdir(), 'dialsheet-pg-spec-'));
    // When run as root the server's own user must pass through this directory.
    fs.chmodSync(base, 0o711);
    cluster = await defineCluster({ dir: path.join(base, 'postgres'), port: await freePort(), throwaway: true });
  }, 30_000);

  afterAll(async () => {
    if (cluster) await destroyCluster(cluster);
    fs.rmSync(base, { recursive: true, force: true });
  }, 60_000);

  it('initialises once, with a private password file', async () => {
    expect(await initCluster(cluster)).toBe(true);
    expect(isInitialised(cluster)).toBe(true);
    expect(fs.statSync(cluster.passwordFile).mode & 0o777).toBe(0o600);
    expect(fs.statSync(cluster.dir).mode & 0o777).toBe(0o700);
    expect(await initCluster(cluster)).toBe(false);
  }, 60_000);

  it('starts on its port, creates a database once and answers queries with the password', async () => {
    expect(runningPort(cluster)).toBeUndefined();
    await startCluster(cluster);
    expect(runningPort(cluster)).toBe(cluster.port);
    expect(await ensureDatabase(cluster, 'spec_db')).toBe(true);
    expect(await ensureDatabase(cluster, 'spec_db')).toBe(false);
    expect(await query(cluster, "SELECT current_database() || ' ' || current_user || ' ' || pg_encoding_to_char(encoding) FROM pg_database WHERE datname = current_database()", 'spec_db')).toBe(
      'spec_db dialsheet UTF8',
    );
    expect(await query(cluster, 'SHOW listen_addresses')).toBe('127.0.0.1');
    const url = new URL(databaseUrl(cluster, 'spec_db'));
    expect([url.hostname, url.port, url.username, url.pathname]).toEqual(['127.0.0.1', String(cluster.port), 'dialsheet', '/spec_db']);
    expect(decodeURIComponent(url.password)).toBe(fs.readFileSync(cluster.passwordFile, 'utf8').trim());
  }, 60_000);

  it('refuses a wrong password (scram-sha-256, not trust)', async () => {
    const saved = fs.readFileSync(cluster.passwordFile, 'utf8');
    fs.writeFileSync(cluster.passwordFile, 'not-the-password\n');
    try {
      await expect(query(cluster, 'SELECT 1')).rejects.toThrow(/password authentication failed/);
    } finally {
      fs.writeFileSync(cluster.passwordFile, saved);
    }
  }, 30_000);

  it('keeps its data across a stop and a restart', async () => {
    await query(cluster, 'CREATE TABLE kept (v int); INSERT INTO kept VALUES (42)', 'spec_db');
    await stopCluster(cluster);
    expect(runningPort(cluster)).toBeUndefined();
    await startCluster(cluster);
    expect(await query(cluster, 'SELECT v FROM kept', 'spec_db')).toBe('42');
    await stopCluster(cluster);
  }, 60_000);

  it('will not start on a port another program holds', async () => {
    const blocker = net.createServer();
    await new Promise<void>((resolve) => blocker.listen(cluster.port, '127.0.0.1', resolve));
    try {
      await expect(startCluster(cluster)).rejects.toThrow(`port ${cluster.port} on 127.0.0.1 is already in use`);
    } finally {
      await new Promise((resolve) => blocker.close(resolve));
    }
  }, 30_000);
});
