import { useEffect, useRef } from 'react';

interface SheetCellEditorProps {
  value: string;
  error: string | null;
  saving: boolean;
  label: string;
  onChange: (text: string) => void;
  onCommit: () => void;
  onCancel: () => void;
}

/**
 * One cell's entry being changed in place: Enter saves, Esc puts the stored text back. A plain
 * input (not a form control with its own state) so a table of thousands of cells stays light.
 */
export function SheetCellEditor({ value, error, saving, label, onChange, onCommit, onCancel }: SheetCellEditorProps) {
  const input = useRef<HTMLInputElement>(null);
  useEffect(() => {
    input.current?.focus();
    input.current?.select();
  }, []);
  return (
    <input
      ref={input}
      className={`sheet-cell-editor numeric${error ? ' has-error' : ''}`}
      value={value}
      aria-label={label}
      aria-invalid={error ? true : undefined}
      title={error ?? undefined}
      readOnly={saving}
      spellCheck={false}
      autoComplete="off"
      onChange={(event) => onChange(event.target.value)}
      onDoubleClick={(event) => event.stopPropagation()}
      onKeyDown={(event) => {
        // The grid's own keys (arrows, Enter) must not act while typing here.
        event.stopPropagation();
        if (event.key === 'Enter') {
          event.preventDefault();
          onCommit();
        } else if (event.key === 'Escape') {
          event.preventDefault();
          onCancel();
        }
      }}
    />
  );
}
