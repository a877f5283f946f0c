import { Button, DatePicker, Flex, Select } from 'antd';
import dayjs, { type Dayjs } from 'dayjs';
import type { AuditAction, AuditQuery } from '@dialsheet/common';
import { AUDIT_ACTION_LABELS, DEFAULT_ENTITY_TYPES, entityLabel } from './audit-labels';

export interface ActorOption {
  id: string;
  name: string;
}

interface AuditFiltersProps {
  value: AuditQuery;
  onChange: (next: AuditQuery) => void;
  /** People who can appear as actors, supplied by the page (usually the campaign's members). */
  actors: ActorOption[];
  /** Entity types seen on screen, merged with the known ones. */
  seenEntityTypes?: string[];
}

export function AuditFilters({ value, onChange, actors, seenEntityTypes = [] }: AuditFiltersProps) {
  const entityTypes = [...new Set([...DEFAULT_ENTITY_TYPES, ...seenEntityTypes])];
  const range: [Dayjs, Dayjs] | null = value.from && value.to ? [dayjs(value.from), dayjs(value.to)] : null;
  const hasFilter = Boolean(value.entityType || value.action || value.actorId || value.from || value.to);

  return (
    <Flex gap={8} wrap className="filter-bar" role="search" aria-label="Filter the audit trail">
      <Select
        allowClear
        placeholder="Any entity"
        aria-label="Entity type"
        className="filter-select"
        value={value.entityType}
        options={entityTypes.map((type) => ({ value: type, label: entityLabel(type) }))}
        onChange={(entityType?: string) => onChange({ ...value, entityType, offset: 0 })}
      />
      <Select
        allowClear
        placeholder="Any action"
        aria-label="Action"
        className="filter-select"
        value={value.action}
        options={(Object.keys(AUDIT_ACTION_LABELS) as AuditAction[]).map((action) => ({
          value: action,
          label: AUDIT_ACTION_LABELS[action],
        }))}
        onChange={(action?: AuditAction) => onChange({ ...value, action, offset: 0 })}
      />
      <Select
        allowClear
        showSearch={{ optionFilterProp: 'label' }}
        placeholder="Anyone"
        aria-label="Actor"
        className="filter-select filter-select-wide"
        value={value.actorId}
        options={actors.map((actor) => ({ value: actor.id, label: actor.name }))}
        onChange={(actorId?: string) => onChange({ ...value, actorId, offset: 0 })}
      />
      <DatePicker.RangePicker
        aria-label="Date range"
        value={range}
        allowEmpty={[true, true]}
        onChange={(dates) =>
          onChange({
            ...value,
            // Whole days in local time: from the start of the first to the end of the last.
            from: dates?.[0] ? dates[0].startOf('day').toISOString() : undefined,
            to: dates?.[1] ? dates[1].endOf('day').toISOString() : undefined,
            offset: 0,
          })
        }
      />
      {hasFilter ? (
        <Button type="link" onClick={() => onChange({ limit: value.limit, offset: 0 })}>
          Clear filters
        </Button>
      ) : null}
    </Flex>
  );
}
