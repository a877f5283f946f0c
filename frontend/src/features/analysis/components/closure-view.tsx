import { Descriptions, Flex, Table, Tag, Typography } from 'antd';
import type { BalanceResult, ClosureBudgetLine } from '@dialsheet/common';
import { percent, sig } from '../utils/number-format';

/**
 * The closure in percent with its ± U bar on a scale centred on 0 % (perfect closure): the check
 * passes when the bar reaches 0.
 */
export function ClosureBar({ result }: { result: BalanceResult }) {
  const c = result.closurePercent;
  const u = result.expandedUncertaintyPercent;
  const span = Math.max(Math.abs(c) + u, 2) * 1.25;
  const width = 420;
  const height = 54;
  const x = (p: number) => ((p + span) / (2 * span)) * (width - 40) + 20;
  const color = result.pass ? '#0f766e' : '#b91c1c';
  return (
    <svg
      width="100%"
      viewBox={`0 0 ${width} ${height}`}
      role="img"
      aria-label={`${result.kind} closure ${sig(c, 3)} % ± ${sig(u, 2)} %`}
      className="closure-bar"
      preserveAspectRatio="xMidYMid meet"
    >
      <line x1={20} x2={width - 20} y1={30} y2={30} stroke="#cbd5e1" strokeWidth={1} />
      <line x1={x(0)} x2={x(0)} y1={12} y2={46} stroke="#334155" strokeDasharray="3 3" />
      <text x={x(0)} y={10} textAnchor="middle" fontSize={10} fill="#334155">
        0 %
      </text>
      <line x1={x(c - u)} x2={x(c + u)} y1={30} y2={30} stroke={color} strokeWidth={3} />
      <line x1={x(c - u)} x2={x(c - u)} y1={23} y2={37} stroke={color} strokeWidth={2} />
      <line x1={x(c + u)} x2={x(c + u)} y1={23} y2={37} stroke={color} strokeWidth={2} />
      <circle cx={x(c)} cy={30} r={5} fill={color} />
      <text x={20} y={52} fontSize={10} fill="#64748b">
        {sig(-span, 2)} %
      </text>
      <text x={width - 20} y={52} fontSize={10} fill="#64748b" textAnchor="end">
        +{sig(span, 2)} %
      </text>
    </svg>
  );
}

export function ClosureView({ result }: { result: BalanceResult }) {
  const title = result.kind === 'mass' ? 'Mass balance' : 'Energy balance';
  return (
    <div className="closure-view" data-testid={`closure-${result.kind}`}>
      <Flex gap={12} align="baseline" wrap>
        <Typography.Title level={5} className="closure-title">
          {title}
        </Typography.Title>
        <Typography.Text strong className="numeric closure-number" data-testid={`closure-${result.kind}-percent`}>
          closure {sig(result.closurePercent, 3)} % ± {sig(result.expandedUncertaintyPercent, 2)} %
        </Typography.Text>
        <Tag color={result.pass ? 'green' : 'red'}>{result.pass ? 'closes within its uncertainty' : 'does not close'}</Tag>
      </Flex>
      <ClosureBar result={result} />
      <Descriptions size="small" column={{ xs: 1, md: 3 }} bordered>
        <Descriptions.Item label="R = Σout/Σin">{sig(result.ratio, 5)}</Descriptions.Item>
        <Descriptions.Item label="|R − 1| / U_R">{sig(result.normalisedError, 3)}</Descriptions.Item>
        <Descriptions.Item label={`U_R (k = ${sig(result.coverageFactor, 3)})`}>{sig(result.expandedUncertainty, 3)}</Descriptions.Item>
        <Descriptions.Item label="Σin">
          {sig(result.sumIn, 5)} {result.unit}
        </Descriptions.Item>
        <Descriptions.Item label="Σout">
          {sig(result.sumOut, 5)} {result.unit}
        </Descriptions.Item>
        <Descriptions.Item label="Terms">
          {result.terms.map((t) => `${t.label} (${t.side}) ${sig(t.value, 4)}`).join('; ')}
        </Descriptions.Item>
      </Descriptions>
      <Table<ClosureBudgetLine>
        size="small"
        className="data-table card-footnote"
        rowKey={(l) => `${l.sourceId ?? l.name}|${l.streams.join(',')}`}
        pagination={false}
        dataSource={result.budget}
        columns={[
          { title: 'Source', dataIndex: 'name' },
          { title: 'Shared', key: 'shared', render: (_, l) => (l.sourceId ? <Tag>{l.sourceId}</Tag> : 'own') },
          { title: 'Streams', key: 'streams', render: (_, l) => l.streams.join(', ') },
          { title: 'Effect on R (%)', key: 'effect', align: 'right', render: (_, l) => sig(l.effect * 100, 3) },
          { title: '% of variance', key: 'pct', align: 'right', render: (_, l) => percent(l.percentOfVariance, 3) },
        ]}
      />
    </div>
  );
}
