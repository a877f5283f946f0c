// A run is one recording session of the rig in one configuration; its video is the original record.
import type { SyncMark, SyncMarks } from '../time/sync';
import type { Recording } from './recording';

export interface Run {
  id: string;
  campaignId: string;
  name: string;
  /** Day of the test, YYYY-MM-DD, or null when not given. */
  runDate: string | null;
  /** How the rig was set up, e.g. "flow meter on warm stream". */
  configuration: string;
  /** Who ran the rig (free text: the operator need not have an account). */
  operator: string;
  notes: string;
  /** Marks that tie video time to test time; null until someone marks the start frame. */
  sync: SyncMarks | null;
  recording: Recording | null;
  createdAt: string;
  updatedAt: string;
}

export interface CreateRunRequest {
  name: string;
  runDate?: string | null;
  configuration?: string;
  operator?: string;
  notes?: string;
}

export interface UpdateRunRequest {
  name?: string;
  runDate?: string | null;
  configuration?: string;
  operator?: string;
  notes?: string;
  /** Optional reason stored in the audit trail. */
  reason?: string;
}

export interface SetSyncRequest {
  first: SyncMark;
  /** A later mark that corrects clock drift; null or absent for one mark only. */
  second?: SyncMark | null;
  /** Optional reason stored in the audit trail. */
  reason?: string;
}
