import { Button, Popconfirm } from 'antd';
import { DeleteOutlined } from '@ant-design/icons';
import type { Run } from '@dialsheet/common';
import { useDeleteRun } from '../api/delete-run';

export function DeleteRunButton({ run, onDeleted }: { run: Run; onDeleted: () => void }) {
  const remove = useDeleteRun({ mutationConfig: { onSuccess: onDeleted } });
  return (
    <Popconfirm
      title={`Delete run ${run.name}?`}
      description={
        run.recording
          ? 'Its video, playback copy and sync go too. The audit trail keeps a record of the deletion.'
          : 'The audit trail keeps a record of the deletion.'
      }
      okText="Delete run"
      okButtonProps={{ danger: true, loading: remove.isPending }}
      onConfirm={() => remove.mutateAsync({ runId: run.id, campaignId: run.campaignId }).catch(() => undefined)}
    >
      <Button danger icon={<DeleteOutlined />}>
        Delete
      </Button>
    </Popconfirm>
  );
}
