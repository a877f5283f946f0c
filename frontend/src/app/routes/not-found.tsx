import { Link } from 'react-router-dom';
import { Button, Typography } from 'antd';
import { paths } from '@/config/paths';
import { DialGlyph } from '@/components/ui/brand-mark';
import { useDocumentTitle } from '@/hooks/use-document-title';

export function NotFoundRoute() {
  useDocumentTitle('Page not found');
  return (
    <main className="not-found">
      <div className="not-found-panel">
        <DialGlyph size={44} />
        <div className="not-found-code numeric" aria-hidden="true">
          404
        </div>
        <Typography.Title level={1} className="not-found-title">
          Page not found
        </Typography.Title>
        <Typography.Paragraph type="secondary">
          Nothing lives at this address. The link may be mistyped, or the page has moved.
        </Typography.Paragraph>
        <Link to={paths.campaigns.getHref()}>
          <Button type="primary">Go to your campaigns</Button>
        </Link>
      </div>
    </main>
  );
}
