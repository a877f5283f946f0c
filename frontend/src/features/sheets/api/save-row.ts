import type { SaveRowRequest, SaveRowResponse } from '@dialsheet/common';
import { api } from '@/lib/api-client';

// One row of one pass. The entry screen never calls this directly: rows go through the save queue
// (stores/save-queue.ts), which keeps them in the browser until the server has answered and
// retries on its own, so the queue shows the outcome rather than a notification.
export const saveRow = (sheetId: string, rowIndex: number, body: SaveRowRequest): Promise<SaveRowResponse> =>
  api.put<SaveRowResponse>(`/sheets/${sheetId}/rows/${rowIndex}`, body, { notify: false });
