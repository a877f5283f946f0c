import type { AuditAction } from '@dialsheet/common';

// A record keyed by the union, so adding an action to the common type fails to compile here
// until the runtime list (used to validate queries) knows it too.
const ACTIONS: Record<AuditAction, true> = {
  create: true,
  update: true,
  archive: true,
  restore: true,
  delete: true,
  invite: true,
  join: true,
  revoke: true,
};

export const AUDIT_ACTIONS = Object.keys(ACTIONS) as AuditAction[];

/** What an audit row is about. */
export type AuditEntityType = 'campaign' | 'member' | 'invitation' | 'run' | 'recording' | 'channel' | 'display-region' | 'sheet' | 'reading' | 'resolution' | 'calibration' | 'derived-channel' | 'stability-rule' | 'analysis' | 'release';
