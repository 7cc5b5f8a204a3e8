import { Alert, Button } from 'antd';
import { describeError } from '@/lib/describe-error';
import { IconRefresh } from './icons';

/**
 * The error state of a query: what could not be loaded, why, and what to do,
 * with a retry button.
 */
export function QueryError({ what, error, onRetry }: { what: string; error: unknown; onRetry?: () => void }) {
  const { problem, remedy } = describeError(error);
  return (
    <Alert
      type="error"
      showIcon
      role="alert"
      title={`Could not load ${what}.`}
      description={
        <>
          <div>{problem}</div>
          <div>{remedy}</div>
        </>
      }
      action={
        onRetry ? (
          <Button size="small" icon={<IconRefresh />} onClick={onRetry}>
            Try again
          </Button>
        ) : undefined
      }
    />
  );
}
