import { useMemo, useState } from 'react';
import { Alert, Form, Input, Modal, Table, Tag, Typography } from 'antd';
import type { DashboardRun, Release } from '@dialsheet/common';
import { errorMessage } from '@/lib/api-client';
import { useCreateRelease } from '../api/create-release';
import { notReadyReason } from '../utils/run-readiness';

interface ReleaseRequestModalProps {
  open: boolean;
  campaignId: string;
  runs: DashboardRun[];
  /** Lead: the release is signed in the same call; otherwise it is a request a lead signs later. */
  signNow: boolean;
  onClose: () => void;
  onDone: (release: Release) => void;
}

interface FormValues {
  title: string;
  note?: string;
}

/** Chooses the runs that go in (only ready ones), a title and a note. */
export function ReleaseRequestModal({ open, campaignId, runs, signNow, onClose, onDone }: ReleaseRequestModalProps) {
  const [form] = Form.useForm<FormValues>();
  const [selected, setSelected] = useState<string[]>([]);
  const [runsError, setRunsError] = useState(false);
  const create = useCreateRelease();
  const rows = useMemo(() => runs.map((run) => ({ run, reason: notReadyReason(run) })), [runs]);
  const heading = signNow ? 'Release' : 'Request release';

  const submit = (values: FormValues) => {
    if (selected.length === 0) {
      setRunsError(true);
      return;
    }
    create.mutate(
      {
        campaignId,
        data: { title: values.title.trim(), note: values.note?.trim() || undefined, runIds: selected, ...(signNow ? { sign: true } : {}) },
      },
      {
        onSuccess: (release) => {
          form.resetFields();
          setSelected([]);
          onDone(release);
        },
      },
    );
  };

  return (
    <Modal
      open={open}
      title={heading}
      okText={signNow ? 'Sign and publish' : 'Send request'}
      okButtonProps={{ loading: create.isPending }}
      onOk={() => form.submit()}
      onCancel={() => {
        create.reset();
        onClose();
      }}
      width={760}
      destroyOnHidden
    >
      {signNow ? (
        <Alert
          type="info"
          showIcon
          className="modal-alert"
          title="Signing locks the chosen runs"
          description="Their readings, sheets, calibrations and analyses are frozen into a numbered version with a content hash. Edits to these runs are refused until you open a correction, and a correction leads to a new version."
        />
      ) : (
        <Typography.Paragraph type="secondary">A lead reviews the request and signs it (or declines it with a reason).</Typography.Paragraph>
      )}
      <Form<FormValues> form={form} layout="vertical" onFinish={submit} requiredMark="optional">
        <Form.Item name="title" label="Title" rules={[{ required: true, whitespace: true, message: 'Give the release a title.' }, { max: 200 }]}>
          <Input placeholder="e.g. Baseline runs, both meter positions" maxLength={200} />
        </Form.Item>
        <Form.Item name="note" label="Note">
          <Input.TextArea rows={2} maxLength={4000} placeholder="What is in it and why" />
        </Form.Item>
      </Form>
      <Typography.Text strong>Runs</Typography.Text>
      <Table
        className="data-table release-runs"
        size="small"
        rowKey={(row) => row.run.id}
        pagination={false}
        dataSource={rows}
        aria-label="Runs to release"
        locale={{ emptyText: 'No runs in this campaign yet' }}
        rowSelection={{
          selectedRowKeys: selected,
          onChange: (keys) => {
            setSelected(keys as string[]);
            setRunsError(false);
          },
          getCheckboxProps: (row) => ({ disabled: row.reason !== null, 'aria-label': `Include ${row.run.name}` }),
        }}
        columns={[
          { title: 'Run', key: 'name', render: (_, row) => row.run.name },
          {
            title: 'State',
            key: 'state',
            render: (_, row) =>
              row.reason === null ? (
                <Tag color="green">ready</Tag>
              ) : (
                <Typography.Text type="secondary" className="not-ready-reason">
                  {row.reason}
                </Typography.Text>
              ),
          },
        ]}
      />
      {runsError ? (
        <Typography.Text type="danger" role="alert">
          Choose at least one ready run.
        </Typography.Text>
      ) : null}
      {create.isError ? (
        <Alert type="error" showIcon className="modal-alert" title="Not released" description={errorMessage(create.error)} role="alert" />
      ) : null}
    </Modal>
  );
}
