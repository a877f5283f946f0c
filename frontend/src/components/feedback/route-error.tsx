import { isRouteErrorResponse, useRouteError } from 'react-router-dom';
import { Button, Result } from 'antd';

/** Last line of defence for a page that failed to render or to load its code. */
export function RouteError() {
  const error = useRouteError();
  const detail = isRouteErrorResponse(error)
    ? `${error.status} ${error.statusText}`
    : error instanceof Error
      ? error.message
      : undefined;
  return (
    <Result
      status="error"
      title="This page stopped working"
      subTitle={
        <>
          Nothing you saved is lost. Reload the page to try again.
          {detail ? <div className="error-detail">{detail}</div> : null}
        </>
      }
      extra={
        <Button type="primary" onClick={() => window.location.reload()}>
          Reload
        </Button>
      }
    />
  );
}
