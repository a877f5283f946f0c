import { useRef, useState, type ComponentRef } from 'react';
import { InputNumber, Modal, Typography } from 'antd';

interface GoToRowDialogProps {
  open: boolean;
  rowCount: number;
  current: number;
  onGo: (rowIndex: number) => void;
  onClose: () => void;
  /** The dialog has gone: the screen puts the cursor back into the row. */
  onAfterClose: () => void;
}

/** Ctrl+G: type a row number (from 1) and press Enter. */
export function GoToRowDialog({ open, rowCount, current, onGo, onClose, onAfterClose }: GoToRowDialogProps) {
  const [value, setValue] = useState<number | null>(current + 1);
  const inputRef = useRef<ComponentRef<typeof InputNumber>>(null);
  const valid = value !== null && Number.isInteger(value) && value >= 1 && value <= rowCount;
  const go = () => {
    if (valid) onGo(value - 1);
  };
  return (
    <Modal
      open={open}
      title="Go to row"
      okText="Go"
      onOk={go}
      okButtonProps={{ disabled: !valid }}
      onCancel={onClose}
      destroyOnHidden
      focusable={{ focusTriggerAfterClose: false }}
      afterClose={onAfterClose}
      width={340}
      afterOpenChange={(visible) => {
        if (visible) {
          setValue(current + 1);
          inputRef.current?.focus();
          inputRef.current?.select();
        }
      }}
    >
      <InputNumber
        ref={inputRef}
        autoFocus
        aria-label="Row number"
        min={1}
        max={rowCount}
        precision={0}
        value={value}
        onChange={(next) => setValue(typeof next === 'number' ? next : null)}
        onPressEnter={go}
        className="full-width"
      />
      <Typography.Text type="secondary">Rows 1 to {rowCount}.</Typography.Text>
    </Modal>
  );
}
