import type { AuditAction } from '@dialsheet/common';

// Keyed by the wire type, so a new action in common/ fails the build until it has a label here.
export const AUDIT_ACTION_LABELS: Record<AuditAction, string> = {
  create: 'Created',
  update: 'Changed',
  archive: 'Archived',
  restore: 'Restored',
  delete: 'Removed',
  invite: 'Invited',
  join: 'Joined',
  revoke: 'Revoked',
};

export const AUDIT_ACTION_COLOURS: Record<AuditAction, string> = {
  create: 'green',
  update: 'blue',
  archive: 'default',
  restore: 'cyan',
  delete: 'red',
  invite: 'purple',
  join: 'green',
  revoke: 'orange',
};

/** Entity types recorded so far; others the server sends are still shown, with their raw name. */
const KNOWN_ENTITY_LABELS: Record<string, string> = {
  campaign: 'Campaign',
  member: 'Member',
  invitation: 'Invitation',
  run: 'Run',
  recording: 'Recording',
  channel: 'Channel',
  'display-region': 'Display region',
  sheet: 'Sheet',
  reading: 'Reading',
  resolution: 'Resolution',
};

export const DEFAULT_ENTITY_TYPES = ['campaign', 'member', 'invitation', 'run', 'recording', 'channel', 'display-region', 'sheet', 'reading', 'resolution'];

export function entityLabel(entityType: string): string {
  return KNOWN_ENTITY_LABELS[entityType] ?? entityType.replace(/[_-]+/g, ' ').replace(/^\w/, (c) => c.toUpperCase());
}
