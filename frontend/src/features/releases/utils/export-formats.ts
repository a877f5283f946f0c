import type { ExportFormat } from '@dialsheet/common';

export const EXPORT_FORMAT_LABELS: Record<ExportFormat, string> = {
  'csv-long': 'CSV long',
  'csv-wide': 'CSV wide',
  xlsx: 'XLSX',
  json: 'JSON',
};

const EXTENSIONS: Record<ExportFormat, string> = { 'csv-long': 'csv', 'csv-wide': 'csv', xlsx: 'xlsx', json: 'json' };

/** Used only when the server sent no file name. */
export function fallbackFileName(base: string, format: ExportFormat): string {
  const safe = base.replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^-+|-+$/g, '') || 'dialsheet';
  const suffix = format === 'csv-long' ? '-long' : format === 'csv-wide' ? '-wide' : '';
  return `${safe}${suffix}.${EXTENSIONS[format]}`;
}
