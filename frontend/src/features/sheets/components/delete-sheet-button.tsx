import { Button, Popconfirm } from 'antd';
import { DeleteOutlined } from '@ant-design/icons';
import type { Sheet } from '@dialsheet/common';
import { errorMessage } from '@/lib/api-client';
import { useDeleteSheet } from '../api/delete-sheet';

interface DeleteSheetButtonProps {
  sheet: Sheet;
  onDeleted?: () => void;
  /** The server's refusal (a sheet holding readings is kept), for the list to show beside the sheet. */
  onError: (message: string) => void;
}

export function DeleteSheetButton({ sheet, onDeleted, onError }: DeleteSheetButtonProps) {
  const remove = useDeleteSheet({
    mutationConfig: { onSuccess: () => onDeleted?.(), onError: (error) => onError(errorMessage(error)) },
  });
  const entered = sheet.progress.pass1.done + sheet.progress.pass2.done;
  return (
    <Popconfirm
      title={`Delete sheet ${sheet.name}?`}
      description={
        entered > 0
          ? 'It holds entries; readings are never deleted, so the server will keep it.'
          : 'Nothing has been typed on it yet. The audit trail keeps a record of the deletion.'
      }
      okText="Delete sheet"
      okButtonProps={{ danger: true, loading: remove.isPending }}
      onConfirm={() => remove.mutateAsync({ sheetId: sheet.id, runId: sheet.runId }).catch(() => undefined)}
    >
      <Button size="small" type="text" danger icon={<DeleteOutlined />} aria-label={`Delete ${sheet.name}`} />
    </Popconfirm>
  );
}
