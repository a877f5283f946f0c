// A direct connection to the benchmark's database, for set-up in bulk (rows no API call would
// make quickly) and for checking afterwards what the app stored.
import fs from 'node:fs';
import pg from 'pg';
import type { Scratch } from './harness';

export async function connectDatabase(scratch: Scratch, url: string): Promise<pg.Client> {
  const client = new pg.Client({ connectionString: url, application_name: 'dialsheet-bench' });
  await client.connect();
  scratch.add('close the database connection', () => client.end());
  return client;
}

/** The postmaster's process id: the parent of our own backend (the server runs on this machine). */
export async function postmasterPid(client: pg.Client): Promise<number> {
  const { rows } = await client.query<{ pid: number }>('SELECT pg_backend_pid() AS pid');
  const stat = fs.readFileSync(`/proc/${rows[0].pid}/stat`, 'utf8');
  return Number(stat.slice(stat.lastIndexOf(')') + 2).split(' ')[1]);
}
