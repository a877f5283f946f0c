import { useMutation } from '@tanstack/react-query';
import type { ExportFormat } from '@dialsheet/common';
import type { MutationConfig } from '@/lib/query-client';
import { fetchFile, saveBlob } from '../utils/fetch-file';
import { fallbackFileName } from '../utils/export-formats';

export interface ExportReleaseInput {
  releaseId: string;
  releaseNumber: number | null;
  format: ExportFormat;
  onProgress?: (bytes: number) => void;
}

/** Downloads a published release as a file and saves it; resolves with the saved name. */
export const exportRelease = async ({ releaseId, releaseNumber, format, onProgress }: ExportReleaseInput): Promise<string> => {
  const file = await fetchFile(`/releases/${releaseId}/export`, { format }, onProgress);
  const name = file.fileName ?? fallbackFileName(`release-${releaseNumber ?? releaseId}`, format);
  saveBlob(file.blob, name);
  return name;
};

export function useExportRelease({ mutationConfig }: { mutationConfig?: MutationConfig<typeof exportRelease> } = {}) {
  return useMutation({ ...mutationConfig, mutationFn: exportRelease });
}
