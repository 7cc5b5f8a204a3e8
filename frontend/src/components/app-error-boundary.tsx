import { Component, type ErrorInfo, type ReactNode } from 'react';
import { ErrorPanel } from './error-panel';

/** Last line of defence for render errors outside the router's own error routes. */
export class AppErrorBoundary extends Component<{ children: ReactNode }, { error: unknown }> {
  override state: { error: unknown } = { error: null };

  static getDerivedStateFromError(error: unknown) {
    return { error };
  }

  override componentDidCatch(error: unknown, info: ErrorInfo) {
    console.error('Kiln crashed while drawing the page', error, info.componentStack);
  }

  override render() {
    if (this.state.error) return <ErrorPanel error={this.state.error} />;
    return this.props.children;
  }
}
