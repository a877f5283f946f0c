import { Flex, Spin, Typography } from 'antd';

/** A centred spinner with a word about what is loading, so a wait never looks like a blank page. */
export function PageLoader({ label = 'Loading' }: { label?: string }) {
  return (
    <Flex vertical align="center" justify="center" gap={12} className="page-loader" role="status" aria-live="polite">
      <Spin size="large" />
      <Typography.Text type="secondary">{label}…</Typography.Text>
    </Flex>
  );
}
