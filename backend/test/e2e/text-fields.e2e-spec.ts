// Issue 7, bad input: every free-text field keeps exactly what was typed. Each field below is
// written through the API with text at its length limit (in BMP letters and in emoji, which are
// two UTF-16 units but one character), control characters, right-to-left and emoji sequences, and
// markup; it must come back byte for byte, as a JSON string, in the response and on a later read.
// One character over the limit is a 400 naming the field; so is U+0000, which PostgreSQL cannot
// store in text (refused for every field by the body pipe, with the field's path in the message).
//
// Decisions per field (why nothing else is refused):
// - Every field here keeps tab, newline, ESC, DEL, NEL, U+2028 and bidi controls. They are text a
//   person may paste (notes, reasons, a name copied from a data sheet); the pages show them as
//   text and exports neutralise formulas separately (common/src/export), so refusing them would
//   lose information without removing a risk.
// - Names, titles and symbols are trimmed by design (surrounding whitespace is never meaningful
//   there), so the samples keep their control characters inside the text, never at the ends.
// - Channel symbols and units are identifiers the expression parser and units library read; they
//   are not free text and are not in this table.
import type { AuditEntry, Campaign, Page, Channel, Release, Run, Sheet, SheetMismatches } from '@dialsheet/common';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { TestMedia } from '../helpers/media';
import { bearer, type TestApp, startTestApp } from '../helpers/test-app';
import { call, enter, finish, openSheet, releaseWorld, type ReleaseWorld } from './release-fixture';

/** Samples every field must keep byte-exact (none begins or ends with whitespace: names are trimmed). */
const SAMPLES: Record<string, string> = {
  control: 'a\tb\nc\r\nd\u0001\u0007\u001b[31m red \u001b[0m\u007f\u0085\u2028\u2029e\u000bf\u000cg',
  rtlEmoji: 'שלום مرحبا \u202eabc\u202c \u200f 👩‍🔬 🇳🇿 🙂🏽 e\u0301 \u200b\uFEFF end',
  imgTag: '<img src=x onerror=alert(1)>',
  script: '<script>alert("x")</script>&amp;&lt;b&gt; </textarea><b>bold</b>',
  attribute: `"'><svg/onload=alert(1)> {{constructor.constructor('alert(1)')()}} \${alert(1)}`,
  formula: '=HYPERLINK("http://example.test","click")',
  jsonish: '{"__proto__":{"isAdmin":true}} \\u0000 \\n',
};

const longBmp = (n: number) => 'Ωx<é&'.repeat(Math.ceil(n / 5)).slice(0, n);
const longEmoji = (n: number) => '🙂'.repeat(n);

interface Field {
  name: string;
  /** The DTO's limit, in characters (an emoji counts once). */
  max: number;
  /** The JSON key that carries the text (named in the 400 message). */
  key: string;
  /** Writes the text; returns the response. */
  write: (text: string) => Promise<{ status: number; body: unknown; headers: Record<string, string> }>;
  /** The text as the write response holds it (undefined when the response does not echo it). */
  echoed?: (body: unknown) => unknown;
  /** Reads the stored text back with a fresh request. */
  read: (writeBody: unknown) => Promise<unknown>;
}

function bytes(text: unknown): string {
  expect(typeof text).toBe('string');
  return Buffer.from(text as string, 'utf8').toString('hex');
}

describe('free-text fields store any text byte-exact and return it as JSON text', () => {
  let t: TestApp;
  let media: TestMedia;
  let w: ReleaseWorld;
  let sheet: Sheet;
  let resolutionVersion = 0;
  let counter = 0;
  const unique = (label: string) => `${label} ${++counter}`;
  const fields: Field[] = [];

  async function latestAudit(entityId: string): Promise<AuditEntry> {
    const res = await call(t.http, 'get', `/api/campaigns/${w.f.campaign.id}/audit?limit=200`, w.f.tokens.lead);
    expect(res.status).toBe(200);
    const entries = (res.body as Page<AuditEntry>).items;
    const mine = entries.filter((e) => e.entityId === entityId).sort((a, b) => b.seq - a.seq);
    expect(mine.length).toBeGreaterThan(0);
    return mine[0];
  }

  beforeAll(async () => {
    t = await startTestApp();
    media = new TestMedia();
    w = await releaseWorld(t, media, 'Text fields campaign');
    sheet = await openSheet(t, w, 'Resolution sheet');
    await enter(t, w, sheet, 1, [['20.0', '2.315'], ['20.1', '2.316']]);
    await finish(t, w, sheet, 1);
    await enter(t, w, sheet, 2, [['20.0', '2.351'], ['20.1', '2.316']]);
    await finish(t, w, sheet, 2);
    const { f, run, V } = w;
    const lead = f.tokens.lead;
    const engineer = f.tokens.engineer;

    const campaignField = (key: 'name' | 'description', max: number): Field => ({
      name: `campaign ${key}`,
      max,
      key,
      write: (text) => call(t.http, 'post', '/api/campaigns', lead).send(key === 'name' ? { name: text } : { name: unique('Campaign'), description: text }),
      echoed: (b) => (b as Campaign)[key],
      read: async (b) => ((await call(t.http, 'get', `/api/campaigns/${(b as Campaign).id}`, lead)).body as Campaign)[key],
    });
    const runField = (key: 'name' | 'configuration' | 'operator' | 'notes', max: number): Field => ({
      name: `run ${key}`,
      max,
      key,
      write: (text) => call(t.http, 'post', `/api/campaigns/${f.campaign.id}/runs`, lead).send({ name: unique('Run'), [key]: text }),
      echoed: (b) => (b as Run)[key],
      read: async (b) => ((await call(t.http, 'get', `/api/runs/${(b as Run).id}`, lead)).body as Run)[key],
    });
    const channelField = (key: 'name' | 'quantity', max: number): Field => ({
      name: `channel ${key}`,
      max,
      key,
      write: (text) =>
        call(t.http, 'post', `/api/campaigns/${f.campaign.id}/channels`, lead).send({
          name: unique('Gauge'),
          symbol: `G${++counter}`,
          quantity: 'pressure',
          rawUnit: 'kPa',
          resolution: 0.1,
          rangeMin: 0,
          rangeMax: 100,
          [key]: text,
        }),
      echoed: (b) => (b as Channel)[key],
      read: async (b) => {
        const list = (await call(t.http, 'get', `/api/campaigns/${f.campaign.id}/channels`, lead)).body as Channel[];
        return list.find((c) => c.id === (b as Channel).id)?.[key];
      },
    });

    fields.push(
      campaignField('name', 200),
      campaignField('description', 5000),
      {
        name: 'campaign change reason (audit trail)',
        max: 1000,
        key: 'reason',
        write: (text) => call(t.http, 'patch', `/api/campaigns/${f.campaign.id}`, lead).send({ description: unique('Description'), reason: text }),
        read: async () => (await latestAudit(f.campaign.id)).reason,
      },
      runField('name', 200),
      runField('configuration', 1000),
      runField('operator', 200),
      runField('notes', 10_000),
      channelField('name', 200),
      channelField('quantity', 100),
      {
        name: 'sheet name',
        max: 200,
        key: 'name',
        write: (text) => call(t.http, 'post', `/api/runs/${run.id}/sheets`, engineer).send({ name: text, startTime: 0, endTime: 2, interval: 2, channelIds: [V.id] }),
        echoed: (b) => (b as Sheet).name,
        read: async (b) => ((await call(t.http, 'get', `/api/sheets/${(b as Sheet).id}`, engineer)).body as Sheet).name,
      },
      {
        name: 'resolution reason',
        max: 500,
        key: 'reason',
        write: async (text) => {
          const res = await call(t.http, 'put', `/api/sheets/${sheet.id}/resolutions/0/${V.id}`, f.tokens.checker).send({
            rawText: '2.315',
            reason: text,
            baseVersion: resolutionVersion || undefined,
          });
          if (res.status === 200) resolutionVersion += 1;
          return res;
        },
        echoed: (b) => (b as { reason: string }).reason,
        read: async () => {
          const res = await call(t.http, 'get', `/api/sheets/${sheet.id}/mismatches`, lead);
          return (res.body as SheetMismatches).cells.find((c) => c.rowIndex === 0 && c.channelId === V.id)?.resolution?.reason;
        },
      },
      {
        name: 'derived channel name',
        max: 200,
        key: 'name',
        write: (text) =>
          call(t.http, 'post', `/api/campaigns/${f.campaign.id}/derived-channels`, engineer).send({ name: text, symbol: `D${++counter}`, unit: 'V', expression: 'V1 * 2' }),
        echoed: (b) => (b as { name: string }).name,
        read: async (b) => {
          const list = (await call(t.http, 'get', `/api/campaigns/${f.campaign.id}/derived-channels`, engineer)).body as Array<{ id: string; name: string }>;
          return list.find((d) => d.id === (b as { id: string }).id)?.name;
        },
      },
      {
        name: 'stability rule name',
        max: 200,
        key: 'name',
        write: (text) => call(t.http, 'post', `/api/campaigns/${f.campaign.id}/stability-rules`, engineer).send({ name: text, windowSeconds: 30, slopeLimitPerMinute: 0.5 }),
        echoed: (b) => (b as { name: string }).name,
        read: async (b) => {
          const list = (await call(t.http, 'get', `/api/campaigns/${f.campaign.id}/stability-rules`, engineer)).body as Array<{ id: string; name: string }>;
          return list.find((d) => d.id === (b as { id: string }).id)?.name;
        },
      },
      ...(['title', 'note'] as const).map(
        (key): Field => ({
          name: `release ${key}`,
          max: key === 'title' ? 200 : 5000,
          key,
          write: async (text) => {
            const res = await call(t.http, 'post', `/api/campaigns/${f.campaign.id}/releases`, engineer).send({ title: unique('Release'), runIds: [run.id], [key]: text });
            // Declined straight after reading, so the next request is not refused as a duplicate.
            return res;
          },
          echoed: (b) => (b as Release)[key],
          read: async (b) => {
            const id = (b as Release).id;
            const stored = ((await call(t.http, 'get', `/api/releases/${id}`, lead)).body as Release)[key];
            expect((await call(t.http, 'post', `/api/releases/${id}/decline`, lead).send({ reason: 'cleared by the text test' })).status).toBe(200);
            return stored;
          },
        }),
      ),
      {
        name: 'release decline reason',
        max: 2000,
        key: 'reason',
        write: async (text) => {
          const req = await call(t.http, 'post', `/api/campaigns/${f.campaign.id}/releases`, engineer).send({ title: unique('Release'), runIds: [run.id] });
          expect(req.status, JSON.stringify(req.body)).toBe(201);
          const id = (req.body as Release).id;
          const res = await call(t.http, 'post', `/api/releases/${id}/decline`, lead).send({ reason: text });
          if (res.status !== 200) expect((await call(t.http, 'post', `/api/releases/${id}/decline`, lead).send({ reason: 'cleared' })).status).toBe(200);
          return res;
        },
        echoed: (b) => (b as Release).declineReason,
        read: async (b) => ((await call(t.http, 'get', `/api/releases/${(b as Release).id}`, lead)).body as Release).declineReason,
      },
      {
        name: 'user name',
        max: 100,
        key: 'name',
        write: (text) => t.http.patch('/api/auth/me').set(bearer(f.tokens.reader)).send({ name: text }),
        echoed: (b) => (b as { name: string }).name,
        read: async () => ((await t.http.get('/api/auth/me').set(bearer(f.tokens.reader))).body as { name: string }).name,
      },
    );
  }, 180_000);

  afterAll(async () => {
    await t?.close();
  });

  it('lists the fields it checks (a field dropped from the table fails here)', () => {
    expect(fields.map((f) => f.name)).toHaveLength(17);
  });

  it.each(Object.keys(SAMPLES))('keeps %s text byte-exact in every field', async (sample) => {
    const text = SAMPLES[sample];
    for (const field of fields) {
      const res = await field.write(text);
      expect(res.status, `${field.name}: ${JSON.stringify(res.body)}`).toBeLessThan(300);
      expect(res.headers['content-type'], field.name).toMatch(/^application\/json/);
      if (field.echoed) expect(bytes(field.echoed(res.body)), `${field.name} (response)`).toBe(bytes(text));
      expect(bytes(await field.read(res.body)), `${field.name} (read back)`).toBe(bytes(text));
    }
  });

  it('keeps text at the length limit, counted in characters (an emoji is one)', async () => {
    for (const field of fields) {
      for (const text of [longBmp(field.max), longEmoji(field.max)]) {
        const res = await field.write(text);
        expect(res.status, `${field.name} at ${field.max}: ${JSON.stringify(res.body).slice(0, 300)}`).toBeLessThan(300);
        expect(bytes(await field.read(res.body)), `${field.name} at ${field.max}`).toBe(bytes(text));
      }
    }
  });

  it('refuses one character over the limit with a 400 that names the field, and keeps what was stored', async () => {
    for (const field of fields) {
      // Unique, since some names must be unique within their campaign.
      const kept = `${++counter} ${longBmp(field.max)}`.slice(0, field.max);
      const saved = await field.write(kept);
      expect(saved.status, field.name).toBeLessThan(300);
      const res = await field.write(longBmp(field.max + 1));
      expect(res.status, `${field.name}: ${JSON.stringify(res.body).slice(0, 300)}`).toBe(400);
      expect(JSON.stringify((res.body as { message: unknown }).message), field.name).toContain(field.key);
      expect(bytes(await field.read(saved.body)), `${field.name} after the refusal`).toBe(bytes(kept));
    }
  });

  it('refuses U+0000 (PostgreSQL cannot store it) with a 400 naming the field, and keeps what was stored', async () => {
    for (const field of fields) {
      const kept = `${SAMPLES.imgTag} ${++counter}`;
      const saved = await field.write(kept);
      expect(saved.status, field.name).toBeLessThan(300);
      const res = await field.write(`before\u0000after`);
      expect(res.status, `${field.name}: ${JSON.stringify(res.body)}`).toBe(400);
      expect((res.body as { message: string }).message, field.name).toMatch(new RegExp(`^${field.key}: .*U\\+0000`));
      expect(bytes(await field.read(saved.body)), `${field.name} after the refusal`).toBe(bytes(kept));
    }
  });
});
