import type { NotificationSettings } from '@kiln/shared';
import { App, Card, Skeleton, Switch } from 'antd';
import { QueryError } from '@/components/query-error';
import { describeError } from '@/lib/describe-error';
import { useNotificationSettings, useUpdateNotificationSettings } from '../api/notification-settings';

const SWITCHES: { key: keyof NotificationSettings; label: string; hint: string }[] = [
  { key: 'sweepFinished', label: 'A sweep of mine finished', hint: 'once, when its last run ends' },
  { key: 'runFailed', label: 'A run of mine failed', hint: 'a software error stopped it (not a blow-up or a time limit)' },
  { key: 'candidate', label: 'A run of mine became a blow-up candidate', hint: 'with a link to its evidence' },
  { key: 'quotaNearlyUsed', label: 'My CPU-hours for the month are nearly used', hint: 'once a month' },
];

/** Which e-mails Kiln sends the signed-in person; each switch saves at once. */
export function NotificationSwitches() {
  const settings = useNotificationSettings();
  const update = useUpdateNotificationSettings();
  const { message } = App.useApp();
  return (
    <Card title="E-mail notifications" className="panel" size="small" extra={<span className="panel__meta">each is sent once</span>}>
      {settings.isPending ? (
        <Skeleton active paragraph={{ rows: 3 }} />
      ) : settings.isError ? (
        <QueryError what="your notification settings" error={settings.error} onRetry={() => void settings.refetch()} />
      ) : (
        <ul className="switch-list">
          {SWITCHES.map((s) => (
            <li key={s.key}>
              <Switch
                aria-label={s.label}
                checked={settings.data[s.key]}
                loading={update.isPending && update.variables?.[s.key] !== undefined}
                onChange={(on) =>
                  update.mutate(
                    { [s.key]: on },
                    {
                      onSuccess: () => void message.success(`${s.label}: ${on ? 'you will get an e-mail' : 'no e-mail'}.`),
                      onError: (error) => void message.error(`Not saved. ${describeError(error).problem}`),
                    },
                  )
                }
              />
              <span>
                <span className="switch-list__label">{s.label}</span>
                <span className="switch-list__hint">{s.hint}</span>
              </span>
            </li>
          ))}
        </ul>
      )}
    </Card>
  );
}
