export type AuditAction = 'create' | 'update' | 'archive' | 'delete' | 'invite' | 'join' | 'revoke' | 'restore';

export interface AuditEntry {
  id: string;
  /** Monotonic sequence number across the whole trail. */
  seq: number;
  campaignId: string | null;
  actorId: string | null;
  actorName: string | null;
  entityType: string;
  entityId: string;
  action: AuditAction;
  before: Record<string, unknown> | null;
  after: Record<string, unknown> | null;
  reason: string | null;
  createdAt: string;
}

export interface AuditQuery {
  entityType?: string;
  actorId?: string;
  action?: AuditAction;
  from?: string;
  to?: string;
  limit?: number;
  offset?: number;
}

export interface Page<T> {
  items: T[];
  total: number;
  limit: number;
  offset: number;
}
