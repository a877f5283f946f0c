import { Alert, Descriptions, Flex, Table, Tag, Typography } from 'antd';
import type { BudgetComponent, StabilityVerdict, StableValue, UncertaintyBudget } from '@dialsheet/common';
import { interval, percent, plusMinus, sig } from '../utils/number-format';

/** The GUM budget: each component as stated, its divisor and sensitivity, its share; then u_c, k, U. */
export function BudgetTable({ budget }: { budget: UncertaintyBudget }) {
  return (
    <div data-testid="budget-table">
      <Table<BudgetComponent>
        size="small"
        className="data-table"
        rowKey={(c) => `${c.name}|${c.sourceId ?? ''}|${c.note ?? ''}`}
        pagination={false}
        dataSource={budget.components}
        columns={[
          { title: 'Component', key: 'name', render: (_, c) => (c.note ? <span title={c.note}>{c.name}</span> : c.name) },
          { title: 'Stated', key: 'value', align: 'right', render: (_, c) => `${sig(c.value)} ${c.unit}` },
          { title: 'Distribution', dataIndex: 'distribution' },
          { title: 'Divisor', key: 'divisor', align: 'right', render: (_, c) => sig(c.divisor, 4) },
          { title: 'Sensitivity', key: 'sensitivity', align: 'right', render: (_, c) => sig(c.sensitivity) },
          { title: `Contribution (${budget.unit})`, key: 'contribution', align: 'right', render: (_, c) => sig(c.contribution, 3) },
          { title: '% of variance', key: 'percent', align: 'right', render: (_, c) => percent(c.percentOfVariance, 3) },
          { title: 'Shared source', key: 'source', render: (_, c) => c.sourceId ?? '' },
        ]}
        summary={() => (
          <>
            <Table.Summary.Row>
              <Table.Summary.Cell index={0} colSpan={5}>
                Combined standard uncertainty u_c
              </Table.Summary.Cell>
              <Table.Summary.Cell index={5} align="right">
                <span data-testid="budget-uc">{sig(budget.combinedStandardUncertainty, 3)}</span>
              </Table.Summary.Cell>
              <Table.Summary.Cell index={6} colSpan={2} />
            </Table.Summary.Row>
            <Table.Summary.Row>
              <Table.Summary.Cell index={0} colSpan={5}>
                Expanded uncertainty U = k·u_c, k = {sig(budget.coverageFactor, 3)}
              </Table.Summary.Cell>
              <Table.Summary.Cell index={5} align="right">
                <span data-testid="budget-U">{sig(budget.expandedUncertainty, 3)}</span>
              </Table.Summary.Cell>
              <Table.Summary.Cell index={6} colSpan={2}>
                {budget.relativeExpandedPercent !== null ? `${sig(budget.relativeExpandedPercent, 3)} % of the value` : ''}
              </Table.Summary.Cell>
            </Table.Summary.Row>
          </>
        )}
      />
    </div>
  );
}

export function StabilityVerdictView({ verdict }: { verdict: StabilityVerdict }) {
  return (
    <div data-testid="stability-verdict">
      <Flex gap={8} align="center" className="verdict-head">
        <Typography.Text strong>Rule “{verdict.rule}”</Typography.Text>
        <Tag color={verdict.pass ? 'green' : 'red'}>{verdict.pass ? 'steady' : 'not steady'}</Tag>
        <Typography.Text type="secondary">
          window {sig(verdict.window.from, 6)}–{sig(verdict.window.to, 6)} s, {verdict.n} readings
        </Typography.Text>
      </Flex>
      <ul className="verdict-parts">
        {verdict.parts.map((p) => (
          <li key={p.part}>
            <Tag color={p.pass ? 'green' : 'red'}>{p.pass ? 'pass' : 'fail'}</Tag> {p.part}: {p.message}
          </li>
        ))}
      </ul>
    </div>
  );
}

/** Fit, value at t* with its intervals, warnings and the budget. */
export function StableValueResult({ stable, stability }: { stable: StableValue; stability: StabilityVerdict | null }) {
  const fit = stable.fit;
  const p = stable.prediction;
  const unit = stable.unit;
  const conf = `${sig(fit.confidence * 100, 3)} %`;
  return (
    <div className="stable-value-result">
      <Typography.Title level={4} className="stable-value-headline numeric" data-testid="stable-value">
        {plusMinus(stable.value, stable.expandedUncertainty, unit, 5)}
      </Typography.Title>
      <Typography.Text type="secondary">
        at t* = {sig(stable.tStar, 6)} s (k = {sig(stable.budget.coverageFactor, 3)}); raw display value {sig(stable.rawValue, 5)} {stable.rawUnit}
      </Typography.Text>
      <Descriptions size="small" column={{ xs: 1, md: 2 }} bordered className="card-footnote">
        <Descriptions.Item label="Slope">
          <span data-testid="fit-slope">{sig(fit.slopePerMinute, 4)}</span> {unit}/min, {conf} CI{' '}
          {interval(fit.slopeIntervalPerMinute.low, fit.slopeIntervalPerMinute.high, `${unit}/min`, 3)}
        </Descriptions.Item>
        <Descriptions.Item label="R²">
          <span data-testid="fit-r2">{fit.rSquared === null ? 'undefined (all values equal)' : sig(fit.rSquared, 4)}</span>
        </Descriptions.Item>
        <Descriptions.Item label="Residual s.d.">
          <span data-testid="fit-sd">{sig(fit.residualSd, 3)}</span> {unit}
        </Descriptions.Item>
        <Descriptions.Item label="Readings fitted">
          {fit.n}
          {fit.uncheckedCount > 0 ? `, ${fit.uncheckedCount} unchecked` : ''} ({sig(fit.tMin, 6)}–{sig(fit.tMax, 6)} s)
        </Descriptions.Item>
        <Descriptions.Item label={`Value at t*, ${conf} CI of the mean`}>
          <span data-testid="value-ci">{interval(p.meanInterval.low, p.meanInterval.high, unit, 5)}</span>
        </Descriptions.Item>
        <Descriptions.Item label={`${conf} prediction interval`}>
          <span data-testid="value-pi">{interval(p.predictionInterval.low, p.predictionInterval.high, unit, 5)}</span>
        </Descriptions.Item>
      </Descriptions>
      {stable.warnings.length > 0 ? (
        <Alert type="warning" showIcon className="card-footnote" title={stable.warnings.map((w) => <div key={w}>{w}</div>)} />
      ) : null}
      {stability ? <StabilityVerdictView verdict={stability} /> : null}
      <Typography.Title level={5} className="card-footnote">
        Uncertainty budget (JCGM 100:2008)
      </Typography.Title>
      <BudgetTable budget={stable.budget} />
    </div>
  );
}
