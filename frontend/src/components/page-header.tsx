import { Typography } from 'antd';
import type { ReactNode } from 'react';

/** The top of every page: one h1, an optional line under it, and actions on the right. */
export function PageHeader({ title, subtitle, extra }: { title: ReactNode; subtitle?: ReactNode; extra?: ReactNode }) {
  return (
    <header className="page-header">
      <div className="page-header__text">
        <Typography.Title level={1} className="page-header__title">
          {title}
        </Typography.Title>
        {subtitle ? <Typography.Text type="secondary">{subtitle}</Typography.Text> : null}
      </div>
      {extra ? <div className="page-header__extra">{extra}</div> : null}
    </header>
  );
}
