import { NOTIFICATION_KINDS, type CapturedMail, type NotificationSettings } from '@dialsheet/common';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { TestMedia } from '../helpers/media';
import { bearer, createUser, login, startTestApp, waitForMail, type TestApp } from '../helpers/test-app';
import { call, enter, finish, openSheet, releaseWorld, resolve, signRelease, type ReleaseWorld } from './release-fixture';

describe('notification e-mails and each person’s choices', () => {
  let t: TestApp;
  let media: TestMedia;
  let w: ReleaseWorld;
  let admin: string;

  async function mails(): Promise<CapturedMail[]> {
    const res = await t.http.get('/api/admin/mail').set(bearer(admin));
    expect(res.status).toBe(200);
    return res.body as CapturedMail[];
  }

  /** Messages to `to` whose subject matches, among all captured so far. */
  async function mailsTo(to: string, subject: RegExp): Promise<CapturedMail[]> {
    return (await mails()).filter((m) => m.to.includes(to) && subject.test(m.subject));
  }

  beforeAll(async () => {
    t = await startTestApp();
    media = new TestMedia();
    const root = await createUser(t.dataSource, { isAdmin: true, name: 'Platform admin' });
    admin = await login(t.http, root.email);
    w = await releaseWorld(t, media, 'Heat-recovery core notifications');
  }, 120_000);
  afterAll(async () => {
    await t.close();
    media.remove();
  });

  it('reads and switches the kinds (all on by default), refusing unknown kinds and non-booleans with a 400', async () => {
    const path = '/api/users/me/notifications';
    const first = await call(t.http, 'get', path, w.f.tokens.reader);
    expect(first.status).toBe(200);
    expect(first.body).toEqual(Object.fromEntries(NOTIFICATION_KINDS.map((k) => [k, true])));
    expect((await t.http.get(path)).status).toBe(401);

    const bogus = await call(t.http, 'put', path, w.f.tokens.reader).send({ 'weekly-digest': false });
    expect(bogus.status).toBe(400);
    expect(JSON.stringify(bogus.body.message)).toContain('weekly-digest should not exist');
    const notBool = await call(t.http, 'put', path, w.f.tokens.reader).send({ 'pass-finished': 'no' });
    expect(notBool.status).toBe(400);
    expect(JSON.stringify(notBool.body.message)).toContain('pass-finished must be true or false');
    // Nothing was saved by the refusals.
    expect((await call(t.http, 'get', path, w.f.tokens.reader)).body).toEqual(first.body);

    // Off for the reader's assignments and the engineer's pass news; others stay as they were.
    const off = await call(t.http, 'put', path, w.f.tokens.reader).send({ 'sheet-assigned': false });
    expect(off.status).toBe(200);
    expect(off.body as NotificationSettings).toEqual({ 'sheet-assigned': false, 'pass-finished': true, 'mismatches-waiting': true, 'release-published': true });
    expect((await call(t.http, 'put', path, w.f.tokens.engineer).send({ 'pass-finished': false, 'release-published': false })).status).toBe(200);
    expect((await call(t.http, 'get', path, w.f.tokens.engineer)).body).toMatchObject({ 'pass-finished': false, 'release-published': false, 'sheet-assigned': true });
  });

  it('mails assignments, finished passes, waiting mismatches and the published release to their audience, and respects switched-off kinds', async () => {
    const { f } = w;
    const sheet = await openSheet(t, w, 'Notified sheet');
    // Assignment: the checker hears of it; the reader switched it off.
    await waitForMail(t.http, admin, f.users.checker.email, /Sheet "Notified sheet" is yours to check/);

    await enter(t, w, sheet, 1, [
      ['21.4', '2.315'],
      ['21.6', '2.320'],
    ]);
    await finish(t, w, sheet, 1);
    const done1 = await waitForMail(t.http, admin, f.users.lead.email, /Pass 1 of sheet "Notified sheet" is finished/);
    expect(done1.text).toContain(`${f.users.reader.name} finished the first pass of sheet "Notified sheet"`);
    // No mismatch news before pass 2: it would tell the checker about pass 1.
    expect(await mailsTo(f.users.checker.email, /mismatch/i)).toEqual([]);

    await enter(t, w, sheet, 2, [
      ['21.4', '2.351'],
      ['21.6', '2.320'],
    ]);
    await finish(t, w, sheet, 2);
    await waitForMail(t.http, admin, f.users.lead.email, /Pass 2 of sheet "Notified sheet" is finished/);
    const waiting = await waitForMail(t.http, admin, f.users.checker.email, /1 mismatch waits for resolution on sheet "Notified sheet"/);
    expect(waiting.text).toContain(`/campaigns/${f.campaign.id}/sheets/${sheet.id}`);
    await waitForMail(t.http, admin, f.users.lead.email, /1 mismatch waits/);

    await resolve(t, w, sheet, 0, w.V.id, '2.315', 'The frame shows 2.315');
    const release = await signRelease(t, w, 'Notified release');
    for (const actor of ['lead', 'reader', 'checker'] as const) {
      const mail = await waitForMail(t.http, admin, f.users[actor].email, /Release 1 of "Heat-recovery core notifications" is published: Notified release/);
      expect(mail.text).toContain(`Content SHA-256: ${release.contentHash}`);
    }

    // The switched-off kinds never arrived (everything above was sent after them, in order).
    expect(await mailsTo(f.users.reader.email, /is yours to read/)).toEqual([]);
    expect(await mailsTo(f.users.engineer.email, /Pass \d of sheet/)).toEqual([]);
    expect(await mailsTo(f.users.engineer.email, /Release 1/)).toEqual([]);
    // Mismatch news goes to the checker and leads, not to the reader or engineer.
    expect(await mailsTo(f.users.reader.email, /mismatch/i)).toEqual([]);
    expect(await mailsTo(f.users.engineer.email, /mismatch/i)).toEqual([]);
    // The reader switched only assignments off: pass news is not theirs anyway (leads and engineers).
    expect(await mailsTo(f.users.reader.email, /Pass \d of sheet/)).toEqual([]);
  });
});
