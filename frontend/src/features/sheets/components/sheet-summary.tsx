import { Card, Descriptions, Typography } from 'antd';
import type { CampaignMember, Sheet } from '@dialsheet/common';
import { ownPass, type SheetViewer } from '../utils/sheet-access';
import { formatCount, formatInterval, formatTime, memberName } from '../utils/sheet-format';
import { PassProgress } from './pass-progress';
import { SheetLockBanner } from './sheet-lock-banner';
import { SheetStatusTag } from './sheet-status-tag';
import './sheets.css';

interface SheetSummaryProps {
  sheet: Sheet;
  members: CampaignMember[];
  viewer: SheetViewer;
}

/** What the viewer is waiting for, when the blind rule hides the other pass from them. */
function blindNote(sheet: Sheet, viewer: SheetViewer): string | null {
  const pass = ownPass(sheet, viewer);
  if (pass === null || sheet.pass2FinishedAt) return null;
  return pass === 2
    ? 'Pass 1 stays hidden from you until you finish pass 2; then the mismatches open for resolution.'
    : 'Pass 2 stays hidden from you until the checker finishes it.';
}

/** Plan, people and progress per pass, with the lock banner when a release holds the sheet. */
export function SheetSummary({ sheet, members, viewer }: SheetSummaryProps) {
  const mine = ownPass(sheet, viewer);
  const note = blindNote(sheet, viewer);
  const person = (id: string | null, pass: 1 | 2) => {
    const name = memberName(members, id);
    if (!name) return <Typography.Text type="secondary">not assigned</Typography.Text>;
    return (
      <span>
        {name}
        {mine === pass ? <Typography.Text type="secondary"> (you)</Typography.Text> : null}
      </span>
    );
  };
  return (
    <>
      {sheet.lock ? <SheetLockBanner lock={sheet.lock} /> : null}
      <Card size="small" className="section-card sheet-summary">
        <div className="sheet-summary-grid">
          <Descriptions
            size="small"
            column={{ xs: 1, sm: 2 }}
            items={[
              { key: 'reader', label: 'Reader (pass 1)', children: person(sheet.readerId, 1) },
              { key: 'checker', label: 'Checker (pass 2)', children: person(sheet.checkerId, 2) },
              {
                key: 'plan',
                label: 'Plan',
                children: (
                  <span className="numeric">
                    {formatCount(sheet.rowCount)} rows × {sheet.channelIds.length} channels, every {formatInterval(sheet.interval)}
                  </span>
                ),
              },
              {
                key: 'times',
                label: 'Test time',
                children: (
                  <span className="numeric">
                    {formatTime(sheet.startTime)} – {formatTime(sheet.endTime)}
                  </span>
                ),
              },
              { key: 'status', label: 'Status', children: <SheetStatusTag sheet={sheet} /> },
            ]}
          />
          <div className="sheet-summary-progress">
            <PassProgress wide pass={1} progress={sheet.progress.pass1} finishedAt={sheet.pass1FinishedAt} />
            <PassProgress wide pass={2} progress={sheet.progress.pass2} finishedAt={sheet.pass2FinishedAt} />
          </div>
        </div>
        {note ? (
          <Typography.Paragraph type="secondary" className="card-footnote">
            {note}
          </Typography.Paragraph>
        ) : null}
      </Card>
    </>
  );
}
