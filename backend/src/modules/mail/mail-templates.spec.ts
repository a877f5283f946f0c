import { describe, expect, it } from 'vitest';
import { escapeHtml, invitationMail, mismatchesWaitingMail, passFinishedMail, passwordResetMail, releasePublishedMail, sheetAssignmentMail } from './mail-templates';

const appUrl = 'http://127.0.0.1:4321';

describe('invitationMail', () => {
  const mail = invitationMail({
    appUrl,
    token: 'tok_abc-123',
    campaignName: 'Core <test> & co',
    inviterName: 'Lena Lead',
    roles: ['reader', 'checker'],
    expiresAt: new Date('2030-01-08T09:30:00Z'),
  });

  it('links to the accept page with the token, in text and HTML', () => {
    const link = `${appUrl}/invitations/accept?token=tok_abc-123`;
    expect(mail.text).toContain(link);
    expect(mail.html).toContain(`href="${link}"`);
  });

  it('names the campaign, the inviter, the roles and the expiry', () => {
    expect(mail.subject).toBe('Lena Lead invited you to the campaign "Core <test> & co"');
    expect(mail.text).toContain('as: Reader, Checker.');
    expect(mail.text).toContain('2030-01-08 09:30 UTC');
  });

  it('escapes user-typed names in the HTML part', () => {
    expect(mail.html).toContain('Core &#60;test&#62; &#38; co');
    expect(mail.html).not.toContain('<test>');
  });
});

describe('passwordResetMail', () => {
  it('links to the confirm page with the token and says how long it works', () => {
    const mail = passwordResetMail({ appUrl, token: 'r3set', name: 'Rita', validMinutes: 60 });
    const link = `${appUrl}/reset-password/confirm?token=r3set`;
    expect(mail.text).toContain(link);
    expect(mail.html).toContain(`href="${link}"`);
    expect(mail.text).toContain('for 60 minutes');
    expect(mail.text.startsWith('Hello Rita,')).toBe(true);
  });

  it('URL-encodes tokens that are not URL-safe', () => {
    const mail = passwordResetMail({ appUrl, token: 'a+b/c=', name: 'R', validMinutes: 60 });
    expect(mail.text).toContain('token=a%2Bb%2Fc%3D');
  });
});

describe('escapeHtml', () => {
  it('escapes the five HTML-significant characters', () => {
    expect(escapeHtml(`<a href="x">'&'</a>`)).toBe('&#60;a href=&#34;x&#34;&#62;&#39;&#38;&#39;&#60;/a&#62;');
  });
});

describe('sheetAssignmentMail', () => {
  const params = {
    appUrl,
    campaignId: 'c1',
    sheetId: 's1',
    name: 'Rita',
    assignerName: 'Lee <lead>',
    sheetName: 'Warm-up',
    runName: 'Run 1',
    campaignName: 'Core soak',
    rowCount: 31,
    channelCount: 3,
  };

  it('links the reader to the sheet and says which pass is theirs', () => {
    const mail = sheetAssignmentMail({ ...params, pass: 'reader' });
    const link = `${appUrl}/campaigns/c1/sheets/s1`;
    expect(mail.subject).toBe('Sheet "Warm-up" is yours to read');
    expect(mail.text).toContain(link);
    expect(mail.html).toContain(`href="${link}"`);
    expect(mail.text).toContain('first pass');
    expect(mail.text).toContain('31 rows × 3 channels');
  });

  it('tells the checker the second pass is blind, and escapes names in HTML', () => {
    const mail = sheetAssignmentMail({ ...params, pass: 'checker' });
    expect(mail.subject).toBe('Sheet "Warm-up" is yours to check');
    expect(mail.text).toContain('blind second pass');
    expect(mail.html).toContain('Lee &#60;lead&#62;');
    expect(mail.html).not.toContain('<lead>');
  });
});

describe('notification mails of the sign-off part', () => {
  it('tells of a finished pass with a link to the sheet', () => {
    const mail = passFinishedMail({
      appUrl,
      campaignId: 'c1',
      sheetId: 's1',
      name: 'Lena',
      finisherName: 'Pat <reader>',
      pass: 1,
      sheetName: 'Soak',
      runName: 'Run 1',
      campaignName: 'Core',
    });
    expect(mail.subject).toBe('Pass 1 of sheet "Soak" is finished');
    expect(mail.text).toContain(`${appUrl}/campaigns/c1/sheets/s1`);
    expect(mail.html).toContain('Pat &#60;reader&#62;');
  });

  it('counts the waiting mismatches in the subject (singular and plural)', () => {
    const base = { appUrl, campaignId: 'c1', sheetId: 's1', name: 'Sam', sheetName: 'Soak', runName: 'Run 1', campaignName: 'Core' };
    expect(mismatchesWaitingMail({ ...base, count: 1 }).subject).toBe('1 mismatch waits for resolution on sheet "Soak"');
    expect(mismatchesWaitingMail({ ...base, count: 3 }).subject).toBe('3 mismatches wait for resolution on sheet "Soak"');
  });

  it('names the release number, the runs and the content hash', () => {
    const mail = releasePublishedMail({
      appUrl,
      campaignId: 'c1',
      releaseId: 'r9',
      name: 'Ann',
      number: 2,
      title: 'Soak runs',
      signerName: 'Lena',
      campaignName: 'Core',
      runNames: ['Run 1', 'Run 2'],
      contentHash: 'f'.repeat(64),
    });
    expect(mail.subject).toBe('Release 2 of "Core" is published: Soak runs');
    expect(mail.text).toContain('Runs: Run 1, Run 2.');
    expect(mail.text).toContain(`Content SHA-256: ${'f'.repeat(64)}`);
    expect(mail.text).toContain(`${appUrl}/campaigns/c1/releases/r9`);
  });
});
