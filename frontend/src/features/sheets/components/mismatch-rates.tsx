import { Col, Row, Skeleton, Table, Tooltip, Typography } from 'antd';
import type { Channel, ChannelMismatchRate, PersonMismatchRate } from '@dialsheet/common';
import { ErrorState } from '@/components/feedback/error-state';
import { useMismatches } from '../api/get-mismatches';
import { formatCount, formatPercent } from '../utils/sheet-format';
import './sheets.css';

interface MismatchRatesProps {
  sheetId: string;
  /** The sheet's channels, in entry order. */
  channels: Channel[];
}

const count = (n: number) => <span className="numeric">{formatCount(n)}</span>;

function RateCell({ rate, compared }: { rate: number | null; compared: number }) {
  if (rate === null) {
    return (
      <Tooltip title="Nothing compared yet: the rate is not known">
        <Typography.Text type="secondary">–</Typography.Text>
      </Tooltip>
    );
  }
  return (
    <span className="numeric" aria-label={`${formatPercent(rate)} of ${compared} compared`}>
      {formatPercent(rate)}
    </span>
  );
}

/** How often the passes differ, per channel and per person, over the cells both passes have typed. */
export function MismatchRates({ sheetId, channels }: MismatchRatesProps) {
  const mismatches = useMismatches({ sheetId });
  if (mismatches.isPending) return <Skeleton active paragraph={{ rows: 4 }} />;
  if (mismatches.isError) return <ErrorState error={mismatches.error} onRetry={() => void mismatches.refetch()} />;
  const { byChannel, byPerson, complete } = mismatches.data;
  const order = new Map(channels.map((c, i) => [c.id, i]));
  const byId = new Map(channels.map((c) => [c.id, c]));
  const channelRows = byChannel.slice().sort((a, b) => (order.get(a.channelId) ?? 0) - (order.get(b.channelId) ?? 0));
  const personRows = byPerson.slice().sort((a, b) => a.pass - b.pass);

  return (
    <div className="mismatch-rates">
      {!complete ? (
        <Typography.Paragraph type="secondary">
          Over the cells both passes have typed so far; the rates settle once both passes are finished.
        </Typography.Paragraph>
      ) : null}
      <Row gutter={[24, 16]}>
        <Col xs={24} lg={12}>
          <Typography.Title level={5}>Per channel</Typography.Title>
          <Table<ChannelMismatchRate>
            className="data-table rates-table"
            size="small"
            rowKey="channelId"
            pagination={false}
            dataSource={channelRows}
            aria-label="Mismatch rate per channel"
            columns={[
              {
                title: 'Channel',
                key: 'channel',
                render: (_, r) => {
                  const channel = byId.get(r.channelId);
                  return channel ? (
                    <span>
                      <strong className="channel-symbol">{channel.symbol}</strong> {channel.name}
                    </span>
                  ) : (
                    <Typography.Text type="secondary">removed channel</Typography.Text>
                  );
                },
              },
              { title: 'Compared', key: 'compared', align: 'right', render: (_, r) => count(r.compared) },
              { title: 'Mismatches', key: 'mismatches', align: 'right', render: (_, r) => count(r.mismatches) },
              { title: 'Rate', key: 'rate', align: 'right', render: (_, r) => <RateCell rate={r.rate} compared={r.compared} /> },
            ]}
          />
        </Col>
        <Col xs={24} lg={12}>
          <Typography.Title level={5}>Per person</Typography.Title>
          <Table<PersonMismatchRate>
            className="data-table rates-table"
            size="small"
            rowKey={(r) => `${r.userId}:${r.pass}`}
            pagination={false}
            dataSource={personRows}
            aria-label="Mismatch rate per person"
            columns={[
              { title: 'Person', key: 'name', render: (_, r) => r.name },
              { title: 'Pass', key: 'pass', align: 'right', render: (_, r) => count(r.pass) },
              { title: 'Compared', key: 'compared', align: 'right', render: (_, r) => count(r.compared) },
              { title: 'Mismatches', key: 'mismatches', align: 'right', render: (_, r) => count(r.mismatches) },
              { title: 'Rate', key: 'rate', align: 'right', render: (_, r) => <RateCell rate={r.rate} compared={r.compared} /> },
              {
                title: (
                  <Tooltip title="Resolved cells where the resolution differs from this person's entry">
                    <span>Wrong</span>
                  </Tooltip>
                ),
                key: 'wrong',
                align: 'right',
                render: (_, r) => count(r.wrong),
              },
            ]}
          />
        </Col>
      </Row>
    </div>
  );
}
