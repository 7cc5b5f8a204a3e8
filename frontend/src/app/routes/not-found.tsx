import { Button, Typography } from 'antd';
import { useLocation, useNavigate } from 'react-router-dom';
import { IconSignpost } from '@/components/icons';
import { paths } from '@/config/paths';

function NotFoundRoute() {
  const location = useLocation();
  const navigate = useNavigate();
  return (
    <div className="state-panel">
      <title>Page not found · Kiln</title>
      <div className="state-panel__icon">
        <IconSignpost />
      </div>
      <Typography.Title level={1} className="state-panel__title">
        Page not found
      </Typography.Title>
      <Typography.Paragraph type="secondary" className="state-panel__text">
        There is no page at <Typography.Text code>{location.pathname}</Typography.Text>. The link may be mistyped,
        or it points to a part of Kiln that does not exist yet.
      </Typography.Paragraph>
      <Button type="primary" onClick={() => navigate(paths.overview.getHref())}>
        Back to Overview
      </Button>
    </div>
  );
}

export { NotFoundRoute as Component };
