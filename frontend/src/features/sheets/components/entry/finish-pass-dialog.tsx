import { useEffect, useRef } from 'react';
import { Alert, Button, Modal, Space, Typography } from 'antd';
import type { ReadingPass } from '@dialsheet/common';
import { errorMessage } from '@/lib/api-client';
import { useFinishPass } from '../../api/finish-pass';

interface FinishPassDialogProps {
  open: boolean;
  sheetId: string;
  pass: ReadingPass;
  rowCount: number;
  /** Rows still without an entry in some channel (0-based). */
  missingRows: readonly number[];
  /** Rows typed but not yet acknowledged by the server. */
  waiting: number;
  onGoToRow: (rowIndex: number) => void;
  onClose: () => void;
  /** The dialog has gone: the screen puts the cursor back into the row. */
  onAfterClose: () => void;
}

const LISTED = 8;

/**
 * Marks the pass finished. Reached from the last row by the keyboard (the primary button has
 * focus, Enter confirms). The server counts the cells itself and refuses (409) while any has no
 * entry; that answer is shown here, next to the rows this screen knows are incomplete.
 */
export function FinishPassDialog({ open, sheetId, pass, rowCount, missingRows, waiting, onGoToRow, onClose, onAfterClose }: FinishPassDialogProps) {
  const finish = useFinishPass();
  const complete = missingRows.length === 0;
  const firstMissing = missingRows[0];
  const goRef = useRef<HTMLButtonElement>(null);
  const finishRef = useRef<HTMLButtonElement>(null);
  // The last row's save is still on its way when the dialog opens: once it lands, Enter finishes.
  useEffect(() => {
    if (open && complete && waiting === 0) finishRef.current?.focus();
  }, [complete, open, waiting]);

  return (
    <Modal
      open={open}
      title={`Finish pass ${pass}`}
      onCancel={() => {
        finish.reset();
        onClose();
      }}
      destroyOnHidden
      focusable={{ focusTriggerAfterClose: false }}
      afterClose={onAfterClose}
      width={480}
      // The keyboard lands on the button that makes sense: finish when complete, else the first gap.
      afterOpenChange={(visible) => {
        if (visible) (complete || firstMissing === undefined ? finishRef : goRef).current?.focus();
      }}
      footer={
        <Space>
          <Button onClick={onClose}>Keep entering</Button>
          {!complete && firstMissing !== undefined ? (
            <Button ref={goRef} type="primary" onClick={() => onGoToRow(firstMissing)}>
              Go to row {firstMissing + 1}
            </Button>
          ) : null}
          <Button ref={finishRef} type={complete ? 'primary' : 'default'} danger={!complete} loading={finish.isPending} disabled={waiting > 0} onClick={() => finish.mutate({ sheetId, pass })}>
            Finish pass {pass}
          </Button>
        </Space>
      }
    >
      <Space orientation="vertical" size={10} className="full-width">
        {complete ? (
          <Typography.Paragraph>
            Every one of the {rowCount} rows has an entry in each channel. Once finished, pass {pass} no longer changes here; later corrections are
            recorded as resolutions with a reason.
          </Typography.Paragraph>
        ) : (
          <Typography.Paragraph>
            {missingRows.length} row{missingRows.length === 1 ? '' : 's'} still lack an entry in some channel: row
            {missingRows.length === 1 ? '' : 's'} {missingRows.slice(0, LISTED).map((r) => r + 1).join(', ')}
            {missingRows.length > LISTED ? ', …' : ''}. Leave a cell empty and press Enter to record it as blank, or flag it unreadable (Ctrl+U) or
            ambiguous (Ctrl+M).
          </Typography.Paragraph>
        )}
        {waiting > 0 ? (
          <Alert type="info" showIcon title={`Waiting for ${waiting} row${waiting === 1 ? '' : 's'} to reach the server before the pass can be finished.`} />
        ) : null}
        {finish.isError ? <Alert type="error" showIcon title={errorMessage(finish.error)} /> : null}
      </Space>
    </Modal>
  );
}
