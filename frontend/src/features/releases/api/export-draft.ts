import { useMutation } from '@tanstack/react-query';
import type { ExportFormat } from '@dialsheet/common';
import type { MutationConfig } from '@/lib/query-client';
import { fetchFile, saveBlob } from '../utils/fetch-file';
import { fallbackFileName } from '../utils/export-formats';

export interface ExportDraftInput {
  campaignId: string;
  format: ExportFormat;
  /** Empty: every run of the campaign. */
  runIds: string[];
  onProgress?: (bytes: number) => void;
}

/** Live (unsigned) data; the server marks every file it writes this way as a draft. */
export const exportDraft = async ({ campaignId, format, runIds, onProgress }: ExportDraftInput): Promise<string> => {
  const file = await fetchFile(`/campaigns/${campaignId}/export`, { format, runIds: runIds.join(',') }, onProgress);
  const name = file.fileName ?? fallbackFileName('DRAFT-dialsheet-export', format);
  saveBlob(file.blob, name);
  return name;
};

export function useExportDraft({ mutationConfig }: { mutationConfig?: MutationConfig<typeof exportDraft> } = {}) {
  return useMutation({ ...mutationConfig, mutationFn: exportDraft });
}
