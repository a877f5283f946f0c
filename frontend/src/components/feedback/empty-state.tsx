import type { ReactNode } from 'react';
import { Empty, Typography } from 'antd';

/** A quiet dial resting at zero: nothing here yet. */
function RestingDial() {
  return (
    <svg width="56" height="56" viewBox="0 0 56 56" aria-hidden="true" focusable="false">
      <circle cx="28" cy="28" r="25" fill="#FFFFFF" stroke="#CDD3CC" strokeWidth="2" />
      <path d="M11 36 A18 18 0 1 1 45 36" fill="none" stroke="#DDE2DC" strokeWidth="3" strokeDasharray="2 4" />
      <path d="M28 28 L14.5 36.5" stroke="#9AA59F" strokeWidth="2.5" strokeLinecap="round" />
      <circle cx="28" cy="28" r="3" fill="#9AA59F" />
    </svg>
  );
}

interface EmptyStateProps {
  title: string;
  description?: ReactNode;
  action?: ReactNode;
}

/** An empty list that says why it is empty and what to do next. */
export function EmptyState({ title, description, action }: EmptyStateProps) {
  return (
    <Empty
      className="empty-state"
      image={<RestingDial />}
      styles={{ image: { height: 56, marginBottom: 10 } }}
      description={
        <>
          <Typography.Text strong>{title}</Typography.Text>
          {description ? (
            <Typography.Paragraph type="secondary" className="empty-state-text">
              {description}
            </Typography.Paragraph>
          ) : null}
        </>
      }
    >
      {action}
    </Empty>
  );
}
