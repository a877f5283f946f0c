import { useState } from 'react';
import { App, Button, Space, Typography } from 'antd';
import { DownloadOutlined } from '@ant-design/icons';
import { EXPORT_FORMATS, type ExportFormat, type Release } from '@dialsheet/common';
import { errorMessage } from '@/lib/api-client';
import { formatBytes } from '@/lib/format';
import { useExportRelease } from '../api/export-release';
import { EXPORT_FORMAT_LABELS } from '../utils/export-formats';

/** One button per format for a published release; the one downloading shows what has arrived. */
export function ExportButtons({ release }: { release: Release }) {
  const { message } = App.useApp();
  const [busy, setBusy] = useState<ExportFormat | null>(null);
  const [received, setReceived] = useState(0);
  const download = useExportRelease();
  const label = release.number !== null ? `release ${release.number}` : release.title;

  const start = (format: ExportFormat) => {
    setBusy(format);
    setReceived(0);
    download.mutate(
      { releaseId: release.id, releaseNumber: release.number, format, onProgress: setReceived },
      {
        onSuccess: (name) => void message.success(`Saved ${name}`),
        onError: (error) => void message.error(`The ${EXPORT_FORMAT_LABELS[format]} export failed: ${errorMessage(error)}`),
        onSettled: () => setBusy(null),
      },
    );
  };

  return (
    <Space size={4} wrap className="export-buttons">
      {EXPORT_FORMATS.map((format) => (
        <Button
          key={format}
          size="small"
          icon={<DownloadOutlined />}
          loading={busy === format}
          disabled={busy !== null && busy !== format}
          aria-label={`Export ${label} as ${EXPORT_FORMAT_LABELS[format]}`}
          onClick={() => start(format)}
        >
          {EXPORT_FORMAT_LABELS[format]}
        </Button>
      ))}
      {busy ? (
        <Typography.Text type="secondary" className="numeric" role="status">
          Preparing {EXPORT_FORMAT_LABELS[busy]}… {received > 0 ? `${formatBytes(received)} received` : ''}
        </Typography.Text>
      ) : null}
    </Space>
  );
}
