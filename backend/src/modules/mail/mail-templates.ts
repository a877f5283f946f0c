import { CAMPAIGN_ROLE_LABELS, type CampaignRole } from '@dialsheet/common';

export interface RenderedMail {
  subject: string;
  text: string;
  html: string;
}

/** Campaign and person names are typed by users, so they are escaped before going into HTML. */
export function escapeHtml(value: string): string {
  return value.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
}

function layout(title: string, paragraphs: string[], link: { href: string; label: string }, footer: string): string {
  const body = paragraphs.map((p) => `<p style="margin:0 0 12px">${p}</p>`).join('\n');
  return `<!doctype html>
<html><body style="font-family:'Source Sans 3',Arial,sans-serif;color:#1f2933;line-height:1.5;max-width:560px">
<h2 style="font-weight:600;margin:0 0 16px">${escapeHtml(title)}</h2>
${body}
<p style="margin:20px 0"><a href="${escapeHtml(link.href)}" style="background:#0b6e4f;color:#fff;padding:10px 16px;border-radius:4px;text-decoration:none">${escapeHtml(link.label)}</a></p>
<p style="margin:0 0 12px;font-size:13px;color:#52606d">If the button does not work, paste this address into your browser:<br>${escapeHtml(link.href)}</p>
<p style="margin:16px 0 0;font-size:13px;color:#52606d">${escapeHtml(footer)}</p>
</body></html>`;
}

export function invitationLink(appUrl: string, token: string): string {
  return `${appUrl}/invitations/accept?token=${encodeURIComponent(token)}`;
}

export function passwordResetLink(appUrl: string, token: string): string {
  return `${appUrl}/reset-password/confirm?token=${encodeURIComponent(token)}`;
}

const formatDate = (d: Date) => d.toISOString().replace('T', ' ').replace(/:\d\d\.\d{3}Z$/, ' UTC');

export interface InvitationMailParams {
  appUrl: string;
  token: string;
  campaignName: string;
  inviterName: string;
  roles: CampaignRole[];
  expiresAt: Date;
}

export function invitationMail(p: InvitationMailParams): RenderedMail {
  const link = invitationLink(p.appUrl, p.token);
  const roles = p.roles.map((r) => CAMPAIGN_ROLE_LABELS[r]).join(', ');
  const subject = `${p.inviterName} invited you to the campaign "${p.campaignName}"`;
  const footer = `The link works once and until ${formatDate(p.expiresAt)}. If you did not expect this, ignore this message.`;
  const text = [
    `${p.inviterName} has invited you to join the Dialsheet campaign "${p.campaignName}" as: ${roles}.`,
    '',
    'Open this link to accept (you can set up your account there if you have none yet):',
    link,
    '',
    footer,
  ].join('\n');
  const html = layout(
    'You are invited to a campaign',
    [
      `${escapeHtml(p.inviterName)} has invited you to join the Dialsheet campaign <strong>${escapeHtml(p.campaignName)}</strong> as: ${escapeHtml(roles)}.`,
      'Accept below; if you have no account yet you can set one up on the same page.',
    ],
    { href: link, label: 'Accept the invitation' },
    footer,
  );
  return { subject, text, html };
}

export interface PasswordResetMailParams {
  appUrl: string;
  token: string;
  name: string;
  validMinutes: number;
}

export function passwordResetMail(p: PasswordResetMailParams): RenderedMail {
  const link = passwordResetLink(p.appUrl, p.token);
  const subject = 'Choose a new Dialsheet password';
  const footer = `The link works once, for ${p.validMinutes} minutes. If you did not ask for it, ignore this message: your password stays as it is.`;
  const text = [
    `Hello ${p.name},`,
    '',
    'Someone (hopefully you) asked to reset the password of your Dialsheet account. Open this link to choose a new one:',
    link,
    '',
    footer,
  ].join('\n');
  const html = layout(
    'Choose a new password',
    [
      `Hello ${escapeHtml(p.name)},`,
      'Someone (hopefully you) asked to reset the password of your Dialsheet account.',
    ],
    { href: link, label: 'Choose a new password' },
    footer,
  );
  return { subject, text, html };
}

export function sheetLink(appUrl: string, campaignId: string, sheetId: string): string {
  return `${appUrl}/campaigns/${encodeURIComponent(campaignId)}/sheets/${encodeURIComponent(sheetId)}`;
}

export interface SheetAssignmentMailParams {
  appUrl: string;
  campaignId: string;
  sheetId: string;
  /** Which pass this person types. */
  pass: 'reader' | 'checker';
  name: string;
  assignerName: string;
  sheetName: string;
  runName: string;
  campaignName: string;
  rowCount: number;
  channelCount: number;
}

export function sheetAssignmentMail(p: SheetAssignmentMailParams): RenderedMail {
  const link = sheetLink(p.appUrl, p.campaignId, p.sheetId);
  const job =
    p.pass === 'reader'
      ? 'type the first pass: the value on each display at every row'
      : 'type the blind second pass: the same values again, without seeing the first pass until you have finished';
  const size = `${p.rowCount} rows × ${p.channelCount} channels`;
  const subject = `Sheet "${p.sheetName}" is yours to ${p.pass === 'reader' ? 'read' : 'check'}`;
  const footer = 'You received this because a lead or engineer of the campaign assigned the sheet to you.';
  const text = [
    `Hello ${p.name},`,
    '',
    `${p.assignerName} asked you to ${job}.`,
    `Sheet "${p.sheetName}" of run "${p.runName}" in the campaign "${p.campaignName}" (${size}).`,
    '',
    'Open the sheet here:',
    link,
    '',
    footer,
  ].join('\n');
  const html = layout(
    p.pass === 'reader' ? 'A sheet to read' : 'A sheet to check',
    [
      `Hello ${escapeHtml(p.name)},`,
      `${escapeHtml(p.assignerName)} asked you to ${escapeHtml(job)}.`,
      `Sheet <strong>${escapeHtml(p.sheetName)}</strong> of run ${escapeHtml(p.runName)} in the campaign ${escapeHtml(p.campaignName)} (${escapeHtml(size)}).`,
    ],
    { href: link, label: 'Open the sheet' },
    footer,
  );
  return { subject, text, html };
}

// ── Notifications of the sign-off part ──────────────────────────────────────────────────────

export function runLink(appUrl: string, campaignId: string, runId: string): string {
  return `${appUrl}/campaigns/${encodeURIComponent(campaignId)}/runs/${encodeURIComponent(runId)}`;
}

export function releaseLink(appUrl: string, campaignId: string, releaseId: string): string {
  return `${appUrl}/campaigns/${encodeURIComponent(campaignId)}/releases/${encodeURIComponent(releaseId)}`;
}

const SETTINGS_FOOTER = 'You can switch this kind of message off under your notification settings.';

export interface PassFinishedMailParams {
  appUrl: string;
  campaignId: string;
  sheetId: string;
  name: string;
  finisherName: string;
  pass: 1 | 2;
  sheetName: string;
  runName: string;
  campaignName: string;
}

export function passFinishedMail(p: PassFinishedMailParams): RenderedMail {
  const link = sheetLink(p.appUrl, p.campaignId, p.sheetId);
  const what = p.pass === 1 ? 'the first pass' : 'the blind second pass';
  const subject = `Pass ${p.pass} of sheet "${p.sheetName}" is finished`;
  const text = [
    `Hello ${p.name},`,
    '',
    `${p.finisherName} finished ${what} of sheet "${p.sheetName}" (run "${p.runName}", campaign "${p.campaignName}").`,
    '',
    'Open the sheet here:',
    link,
    '',
    SETTINGS_FOOTER,
  ].join('\n');
  const html = layout(
    subject,
    [
      `Hello ${escapeHtml(p.name)},`,
      `${escapeHtml(p.finisherName)} finished ${what} of sheet <strong>${escapeHtml(p.sheetName)}</strong> (run ${escapeHtml(p.runName)}, campaign ${escapeHtml(p.campaignName)}).`,
    ],
    { href: link, label: 'Open the sheet' },
    SETTINGS_FOOTER,
  );
  return { subject, text, html };
}

export interface MismatchesWaitingMailParams {
  appUrl: string;
  campaignId: string;
  sheetId: string;
  name: string;
  count: number;
  sheetName: string;
  runName: string;
  campaignName: string;
}

export function mismatchesWaitingMail(p: MismatchesWaitingMailParams): RenderedMail {
  const link = sheetLink(p.appUrl, p.campaignId, p.sheetId);
  const cells = p.count === 1 ? '1 mismatch waits' : `${p.count} mismatches wait`;
  const subject = `${cells} for resolution on sheet "${p.sheetName}"`;
  const text = [
    `Hello ${p.name},`,
    '',
    `Both passes of sheet "${p.sheetName}" (run "${p.runName}", campaign "${p.campaignName}") are in: ${cells} to be resolved against the frame.`,
    '',
    'Open the sheet here:',
    link,
    '',
    SETTINGS_FOOTER,
  ].join('\n');
  const html = layout(
    'Mismatches to resolve',
    [
      `Hello ${escapeHtml(p.name)},`,
      `Both passes of sheet <strong>${escapeHtml(p.sheetName)}</strong> (run ${escapeHtml(p.runName)}, campaign ${escapeHtml(p.campaignName)}) are in: ${escapeHtml(cells)} to be resolved against the frame.`,
    ],
    { href: link, label: 'Resolve the mismatches' },
    SETTINGS_FOOTER,
  );
  return { subject, text, html };
}

export interface ReleasePublishedMailParams {
  appUrl: string;
  campaignId: string;
  releaseId: string;
  name: string;
  number: number;
  title: string;
  signerName: string;
  campaignName: string;
  runNames: string[];
  contentHash: string;
}

export function releasePublishedMail(p: ReleasePublishedMailParams): RenderedMail {
  const link = releaseLink(p.appUrl, p.campaignId, p.releaseId);
  const subject = `Release ${p.number} of "${p.campaignName}" is published: ${p.title}`;
  const runs = p.runNames.join(', ');
  const text = [
    `Hello ${p.name},`,
    '',
    `${p.signerName} signed release ${p.number} "${p.title}" of the campaign "${p.campaignName}".`,
    `Runs: ${runs}. Their data is now locked; a change needs a new release.`,
    `Content SHA-256: ${p.contentHash}`,
    '',
    'Open the release here:',
    link,
    '',
    SETTINGS_FOOTER,
  ].join('\n');
  const html = layout(
    `Release ${p.number} is published`,
    [
      `Hello ${escapeHtml(p.name)},`,
      `${escapeHtml(p.signerName)} signed release ${p.number} <strong>${escapeHtml(p.title)}</strong> of the campaign ${escapeHtml(p.campaignName)}.`,
      `Runs: ${escapeHtml(runs)}. Their data is now locked; a change needs a new release.`,
      `Content SHA-256: <code>${escapeHtml(p.contentHash)}</code>`,
    ],
    { href: link, label: 'Open the release' },
    SETTINGS_FOOTER,
  );
  return { subject, text, html };
}
