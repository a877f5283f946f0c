import { WarningOutlined } from '@ant-design/icons';
import type { ReadingPass, Resolution } from '@dialsheet/common';
import type { CellState, GridEntry } from '../utils/sheet-grid';
import { SheetCellEditor } from './sheet-cell-editor';

export interface CellEditState {
  text: string;
  error: string | null;
  saving: boolean;
  onChange: (text: string) => void;
  onCommit: () => void;
  onCancel: () => void;
}

interface SheetTableCellProps {
  id: string;
  symbol: string;
  rowNumber: number;
  state: CellState;
  /** Undefined: the pass has no entry; null: the viewer may not see the pass. */
  pass1: GridEntry | undefined | null;
  pass2: GridEntry | undefined | null;
  resolution: Resolution | undefined;
  active: boolean;
  /** In a filtered view, the cell the filter picked (others in the row are context). */
  picked: boolean;
  /** The pass the viewer may change in this cell, when they may. */
  editPass: ReadingPass | null;
  edit: CellEditState | null;
  onActivate: () => void;
  onStartEdit: () => void;
}

const STATE_WORDS: Record<CellState, string> = {
  agree: 'passes agree',
  mismatch: 'mismatch',
  missing: 'missing entry',
  flagged: 'flagged',
  resolved: 'resolved',
  entered: 'entered',
};

function shown(reading: { rawText: string } | undefined): string {
  if (!reading) return '·';
  return reading.rawText.trim() === '' ? 'blank' : reading.rawText;
}

function spoken(pass: ReadingPass, reading: GridEntry | undefined | null): string | null {
  if (reading === null) return null;
  return `pass ${pass} ${reading ? (reading.rawText.trim() === '' ? 'blank' : reading.rawText) : 'no entry'}`;
}

/** One row × channel: pass 1 / pass 2 as typed, coloured by how they compare, with a limit mark. */
export function SheetTableCell(props: SheetTableCellProps) {
  const { id, symbol, rowNumber, state, pass1, pass2, resolution, active, picked, editPass, edit, onActivate, onStartEdit } = props;
  const warnings = [...(pass1?.warnings ?? []), ...(pass2?.warnings ?? [])];
  const label = [
    `${symbol} row ${rowNumber}`,
    spoken(1, pass1),
    spoken(2, pass2),
    STATE_WORDS[state],
    resolution ? `resolved to ${resolution.rawText}` : null,
    warnings.length > 0 ? 'outside a limit' : null,
  ]
    .filter(Boolean)
    .join(', ');

  const part = (pass: ReadingPass, reading: GridEntry | undefined | null) => {
    if (reading === null) return null;
    if (edit && editPass === pass) {
      return (
        <SheetCellEditor
          value={edit.text}
          error={edit.error}
          saving={edit.saving}
          label={`Pass ${pass} entry, ${symbol} row ${rowNumber}`}
          onChange={edit.onChange}
          onCommit={edit.onCommit}
          onCancel={edit.onCancel}
        />
      );
    }
    return <span className={`sheet-cell-pass${reading ? '' : ' is-empty'}${reading?.flag ? ' is-flag' : ''}`}>{shown(reading)}</span>;
  };

  return (
    <div
      id={id}
      role="gridcell"
      aria-label={label}
      aria-selected={active}
      aria-readonly={editPass === null}
      data-state={state}
      className={`sheet-cell is-${state}${active ? ' is-active' : ''}${picked ? ' is-picked' : ''}`}
      onMouseDown={onActivate}
      onDoubleClick={editPass !== null ? onStartEdit : undefined}
    >
      {part(1, pass1)}
      {pass1 !== null && pass2 !== null ? <span className="sheet-cell-sep">/</span> : null}
      {part(2, pass2)}
      {resolution ? <span className="sheet-cell-resolution">→ {shown(resolution)}</span> : null}
      {warnings.length > 0 ? (
        <WarningOutlined className="sheet-cell-warning" title={warnings.map((w) => w.message).join('; ')} aria-hidden />
      ) : null}
    </div>
  );
}
