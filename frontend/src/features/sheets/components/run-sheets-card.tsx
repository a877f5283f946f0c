import { useState } from 'react';
import { Alert, Button, Card, Skeleton, Typography } from 'antd';
import { PlusOutlined } from '@ant-design/icons';
import type { CampaignMember, Channel, Sheet } from '@dialsheet/common';
import { ErrorState } from '@/components/feedback/error-state';
import { EmptyState } from '@/components/feedback/empty-state';
import { useSheets } from '../api/get-sheets';
import { AssignSheetModal } from './assign-sheet-modal';
import { RunSheetsTable } from './run-sheets-table';
import { SheetFormModal } from './sheet-form-modal';
import './sheets.css';

interface RunSheetsCardProps {
  runId: string;
  /** The campaign's channels, in the campaign's order (passed in by the page). */
  channels: Channel[];
  /** The campaign's members, for names and the reader / checker choices; undefined while loading. */
  members: CampaignMember[] | undefined;
  /** Lead or engineer: may plan, assign and delete sheets. */
  canPlan: boolean;
  /** Why no sheet can be planned on this run yet (no sync, recording not ready), or null. */
  planBlocker: string | null;
  /** Test time where the recording ends, when known. */
  maxEndTime: number | null;
}

type Dialog = { kind: 'create' } | { kind: 'edit'; sheet: Sheet } | { kind: 'assign'; sheet: Sheet } | null;

/** The run's reading sheets, with planning and assignment for leads and engineers. */
export function RunSheetsCard({ runId, channels, members, canPlan, planBlocker, maxEndTime }: RunSheetsCardProps) {
  const sheets = useSheets({ runId });
  const [dialog, setDialog] = useState<Dialog>(null);
  const [deleteError, setDeleteError] = useState<{ sheetId: string; message: string } | null>(null);
  const canCreate = canPlan && planBlocker === null && channels.length > 0;

  const createButton = canPlan ? (
    <Button
      type="primary"
      size="small"
      icon={<PlusOutlined />}
      disabled={!canCreate}
      title={planBlocker ?? (channels.length === 0 ? 'Add the campaign’s channels first' : undefined)}
      onClick={() => setDialog({ kind: 'create' })}
    >
      New sheet
    </Button>
  ) : null;

  let body;
  if (sheets.isPending || !members) body = <Skeleton active paragraph={{ rows: 3 }} />;
  else if (sheets.isError) body = <ErrorState error={sheets.error} onRetry={() => void sheets.refetch()} />;
  else if (sheets.data.length === 0) {
    body = (
      <EmptyState
        title="No sheets yet"
        description={
          canPlan
            ? 'A sheet plans the reading of this run: from a start to an end in test time, a row every few seconds, and the displays to read at each row.'
            : 'A lead or engineer plans the sheets of a run and assigns who reads them.'
        }
      />
    );
  } else {
    body = (
      <RunSheetsTable
        sheets={sheets.data}
        members={members}
        canPlan={canPlan}
        onAssign={(sheet) => setDialog({ kind: 'assign', sheet })}
        onEdit={(sheet) => setDialog({ kind: 'edit', sheet })}
        onDeleteError={(sheet, message) => setDeleteError({ sheetId: sheet.id, message })}
      />
    );
  }

  const failedSheet = deleteError ? sheets.data?.find((s) => s.id === deleteError.sheetId) : undefined;

  return (
    <Card size="small" className="section-card" title="Reading sheets" extra={createButton}>
      {canPlan && planBlocker ? (
        <Typography.Paragraph type="secondary" className="card-footnote">
          {planBlocker}
        </Typography.Paragraph>
      ) : null}
      {deleteError ? (
        <Alert
          type="error"
          showIcon
          role="alert"
          closable={{ onClose: () => setDeleteError(null), 'aria-label': 'Dismiss' }}
          className="form-alert"
          title={failedSheet ? `${failedSheet.name} was not deleted` : 'The sheet was not deleted'}
          description={deleteError.message}
        />
      ) : null}
      {body}
      {canPlan && (dialog?.kind === 'create' || dialog?.kind === 'edit') ? (
        <SheetFormModal
          runId={runId}
          channels={channels}
          sheet={dialog.kind === 'edit' ? dialog.sheet : undefined}
          maxEndTime={maxEndTime}
          open
          onClose={() => setDialog(null)}
          onSaved={() => setDialog(null)}
        />
      ) : null}
      {canPlan && members && dialog?.kind === 'assign' ? (
        <AssignSheetModal sheet={dialog.sheet} members={members} open onClose={() => setDialog(null)} onSaved={() => setDialog(null)} />
      ) : null}
    </Card>
  );
}
