import { Modal, Table, Typography } from 'antd';

export interface ShortcutEntry {
  keys: readonly string[];
  description: string;
  group: string;
}

interface ShortcutSheetProps {
  open: boolean;
  onClose: () => void;
  shortcuts: readonly ShortcutEntry[];
}

function KeyCaps({ keys }: { keys: readonly string[] }) {
  return (
    <span className="key-caps">
      {keys.map((key, index) => (
        <span key={`${key}-${index}`}>
          {index > 0 ? <span className="key-then">then</span> : null}
          <kbd>{key}</kbd>
        </span>
      ))}
    </span>
  );
}

/** The list of keyboard shortcuts, opened with `?` anywhere outside a text field. */
export function ShortcutSheet({ open, onClose, shortcuts }: ShortcutSheetProps) {
  const groups = [...new Set(shortcuts.map((s) => s.group))];
  return (
    <Modal open={open} onCancel={onClose} footer={null} title="Keyboard shortcuts" width={520} destroyOnHidden>
      <Typography.Paragraph type="secondary">
        Shortcuts work anywhere except while you are typing in a field.
      </Typography.Paragraph>
      {groups.map((group) => (
        <section key={group} aria-label={group} className="shortcut-group">
          <Typography.Text strong>{group}</Typography.Text>
          <Table
            size="small"
            pagination={false}
            showHeader={false}
            rowKey={(row) => row.keys.join(' ')}
            dataSource={shortcuts.filter((s) => s.group === group)}
            columns={[
              { key: 'keys', width: 150, render: (_, row) => <KeyCaps keys={row.keys} /> },
              { key: 'description', dataIndex: 'description' },
            ]}
          />
        </section>
      ))}
    </Modal>
  );
}
