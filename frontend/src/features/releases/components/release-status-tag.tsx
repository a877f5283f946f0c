import { Tag, Tooltip } from 'antd';
import type { Release } from '@dialsheet/common';

/** requested: waits for a lead; published: signed and locked; declined: with the lead's reason. */
export function ReleaseStatusTag({ release }: { release: Release }) {
  if (release.status === 'published') {
    return release.supersededById ? (
      <Tag color="default">published, superseded</Tag>
    ) : (
      <Tag color="green">published</Tag>
    );
  }
  if (release.status === 'requested') return <Tag color="gold">waiting for sign-off</Tag>;
  return (
    <Tooltip title={release.declineReason ?? undefined}>
      <Tag color="red">declined</Tag>
    </Tooltip>
  );
}

/** "Release 3", or the request's state while it has no number yet. */
export function releaseLabel(release: Release): string {
  return release.number !== null ? `Release ${release.number}` : release.status === 'declined' ? 'Declined request' : 'Request';
}
