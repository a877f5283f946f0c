import type { ReactNode } from 'react';
import { Card, Typography } from 'antd';
import { BrandMark } from '@/components/ui/brand-mark';

interface AuthLayoutProps {
  title: string;
  subtitle?: ReactNode;
  children: ReactNode;
  width?: number;
}

/** Pages reached before signing in: sign-in, password reset, invitation acceptance. */
export function AuthLayout({ title, subtitle, children, width = 400 }: AuthLayoutProps) {
  return (
    <main className="auth-layout">
      <div className="auth-column" style={{ maxWidth: width }}>
        <div className="auth-brand">
          <BrandMark linked={false} />
          <Typography.Text type="secondary" className="auth-tagline">
            Readings from test-rig video, entered twice and traceable to the frame.
          </Typography.Text>
        </div>
        <Card className="auth-card">
          <Typography.Title level={4} className="auth-title">
            {title}
          </Typography.Title>
          {subtitle ? <Typography.Paragraph type="secondary">{subtitle}</Typography.Paragraph> : null}
          {children}
        </Card>
      </div>
    </main>
  );
}
