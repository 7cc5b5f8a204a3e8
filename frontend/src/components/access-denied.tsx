import { Button, Typography } from 'antd';
import { useNavigate } from 'react-router-dom';
import { paths } from '@/config/paths';
import { IconLock } from './icons';

/** The state a page shows when the signed-in person's role may not see it. */
export function AccessDenied({ title, explanation }: { title: string; explanation: string }) {
  const navigate = useNavigate();
  return (
    <div className="state-panel" role="alert">
      <div className="state-panel__icon">
        <IconLock />
      </div>
      <Typography.Title level={2}>{title}</Typography.Title>
      <Typography.Paragraph type="secondary" className="state-panel__text">
        {explanation}
      </Typography.Paragraph>
      <Button type="primary" onClick={() => navigate(paths.overview.getHref())}>
        Back to Overview
      </Button>
    </div>
  );
}
