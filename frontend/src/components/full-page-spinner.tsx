import { Spin } from 'antd';

/** Shown while the app itself (not one panel) is waiting, e.g. checking the session. */
export function FullPageSpinner({ label = 'Loading Kiln…' }: { label?: string }) {
  return (
    <div className="full-page-center" role="status" aria-live="polite">
      <Spin size="large" />
      <span className="full-page-center__label">{label}</span>
    </div>
  );
}
