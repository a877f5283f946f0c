import { Segmented } from 'antd';
import type { SheetFilter } from '../utils/sheet-grid';

interface SheetTableFilterProps {
  value: SheetFilter;
  onChange: (next: SheetFilter) => void;
  /** Mismatches need both passes; a viewer who sees one cannot filter by them. */
  canCompare: boolean;
}

export const SHEET_FILTERS: SheetFilter[] = ['all', 'flagged', 'mismatched', 'warnings'];

export function SheetTableFilter({ value, onChange, canCompare }: SheetTableFilterProps) {
  return (
    <Segmented<SheetFilter>
      size="small"
      value={value}
      onChange={onChange}
      aria-label="Rows to show"
      options={[
        { value: 'all', label: 'All rows' },
        { value: 'flagged', label: 'Flagged' },
        { value: 'mismatched', label: 'Mismatched', disabled: !canCompare },
        { value: 'warnings', label: 'With warnings' },
      ]}
    />
  );
}
