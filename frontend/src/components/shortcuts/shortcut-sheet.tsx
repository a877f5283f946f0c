import { Modal, Table, Typography } from 'antd';

export interface ShortcutEntry {
  /** KeyboardEvent.key values, e.g. ['g', 'c'] or ['ArrowRight']. */
  keys: readonly string[];
  /** Shown as "Shift +" before the key. */
  shift?: boolean;
  description: string;
  group: string;
}

// How a key value reads on a key cap.
const KEY_NAMES: Record<string, string> = {
  ' ': 'Space',
  ArrowLeft: '←',
  ArrowRight: '→',
  ArrowUp: '↑',
  ArrowDown: '↓',
  Escape: 'Esc',
};

export function keyName(key: string): string {
  return KEY_NAMES[key] ?? key;
}

export function shortcutId(entry: Pick<ShortcutEntry, 'keys' | 'shift'>): string {
  return `${entry.shift ? 'shift+' : ''}${entry.keys.join(' ')}`;
}

interface ShortcutSheetProps {
  open: boolean;
  onClose: () => void;
  shortcuts: readonly ShortcutEntry[];
}

function KeyCaps({ keys, shift }: { keys: readonly string[]; shift?: boolean }) {
  return (
    <span className="key-caps">
      {shift ? (
        <>
          <kbd>Shift</kbd>
          <span className="key-then">+</span>
        </>
      ) : null}
      {keys.map((key, index) => (
        <span key={`${key}-${index}`}>
          {index > 0 ? <span className="key-then">then</span> : null}
          <kbd>{keyName(key)}</kbd>
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
            rowKey={shortcutId}
            dataSource={shortcuts.filter((s) => s.group === group)}
            columns={[
              { key: 'keys', width: 150, render: (_, row) => <KeyCaps keys={row.keys} shift={row.shift} /> },
              { key: 'description', dataIndex: 'description' },
            ]}
          />
        </section>
      ))}
    </Modal>
  );
}
