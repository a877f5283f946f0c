import type { ReactNode } from 'react';
import { Button, Result } from 'antd';
import { errorMessage, isApiError } from '@/lib/api-client';

interface ErrorStateProps {
  error?: unknown;
  title?: string;
  description?: ReactNode;
  onRetry?: () => void;
  extra?: ReactNode;
}

/** What a page shows when its data could not be loaded: the server's message and a way on. */
export function ErrorState({ error, title, description, onRetry, extra }: ErrorStateProps) {
  const notFound = isApiError(error, 404);
  const forbidden = isApiError(error, 403);
  const heading =
    title ?? (notFound ? 'Not found' : forbidden ? 'You do not have access to this' : 'This could not be loaded');
  return (
    <Result
      className="error-state"
      // Icons rather than the library's stock illustrations: quieter, and ours.
      status={notFound || forbidden ? 'info' : 'warning'}
      title={heading}
      subTitle={description ?? (error ? errorMessage(error) : undefined)}
      extra={
        <>
          {onRetry && !notFound && !forbidden ? (
            <Button type="primary" onClick={onRetry}>
              Try again
            </Button>
          ) : null}
          {extra}
        </>
      }
    />
  );
}
