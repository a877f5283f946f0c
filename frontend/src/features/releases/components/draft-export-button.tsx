import { useState } from 'react';
import { Alert, App, Button, Checkbox, Form, Modal, Radio, Typography } from 'antd';
import { ExperimentOutlined } from '@ant-design/icons';
import { EXPORT_FORMATS, type ExportFormat } from '@dialsheet/common';
import { errorMessage } from '@/lib/api-client';
import { formatBytes } from '@/lib/format';
import { useExportDraft } from '../api/export-draft';
import { EXPORT_FORMAT_LABELS } from '../utils/export-formats';

interface DraftExportButtonProps {
  campaignId: string;
  runs: Array<{ id: string; name: string }>;
}

/** Live data of chosen runs, before any sign-off; the server marks every such file DRAFT. */
export function DraftExportButton({ campaignId, runs }: DraftExportButtonProps) {
  const { message } = App.useApp();
  const [open, setOpen] = useState(false);
  const [format, setFormat] = useState<ExportFormat>('csv-long');
  const [runIds, setRunIds] = useState<string[]>([]);
  const [received, setReceived] = useState(0);
  const [error, setError] = useState<string | null>(null);
  const download = useExportDraft();

  const show = () => {
    setRunIds(runs.map((r) => r.id));
    setError(null);
    setOpen(true);
  };

  const start = () => {
    setReceived(0);
    setError(null);
    download.mutate(
      { campaignId, format, runIds, onProgress: setReceived },
      {
        onSuccess: (name) => {
          void message.success(`Saved draft ${name}`);
          setOpen(false);
        },
        onError: (cause) => setError(errorMessage(cause)),
      },
    );
  };

  return (
    <>
      <Button icon={<ExperimentOutlined />} onClick={show}>
        Draft export
      </Button>
      <Modal
        open={open}
        title="Draft export of live data"
        okText={download.isPending ? 'Preparing…' : `Download draft ${EXPORT_FORMAT_LABELS[format]}`}
        okButtonProps={{ disabled: runIds.length === 0, loading: download.isPending }}
        onOk={start}
        onCancel={() => setOpen(false)}
        destroyOnHidden
      >
        <Alert
          type="warning"
          showIcon
          className="draft-warning"
          title="DRAFT — not a release"
          description="These are the readings as they stand now: not signed, not locked, and they may still change. Every file says DRAFT in its name and its provenance. Use a signed release for anything you hand on."
        />
        <Form layout="vertical" className="draft-form" onFinish={start}>
          <Form.Item label="Format">
            <Radio.Group value={format} onChange={(e) => setFormat(e.target.value as ExportFormat)} optionType="button">
              {EXPORT_FORMATS.map((f) => (
                <Radio.Button key={f} value={f}>
                  {EXPORT_FORMAT_LABELS[f]}
                </Radio.Button>
              ))}
            </Radio.Group>
          </Form.Item>
          <Form.Item label="Runs" help={runIds.length === 0 ? 'Choose at least one run.' : undefined} validateStatus={runIds.length === 0 ? 'error' : undefined}>
            <Checkbox.Group value={runIds} onChange={(values) => setRunIds(values as string[])} className="draft-runs">
              {runs.map((run) => (
                <Checkbox key={run.id} value={run.id}>
                  {run.name}
                </Checkbox>
              ))}
            </Checkbox.Group>
          </Form.Item>
        </Form>
        {download.isPending ? (
          <Typography.Text type="secondary" role="status" className="numeric">
            Preparing the draft… {received > 0 ? `${formatBytes(received)} received` : ''}
          </Typography.Text>
        ) : null}
        {error ? <Alert type="error" showIcon title="The export failed" description={error} role="alert" /> : null}
      </Modal>
    </>
  );
}
