import { Component, type ReactNode } from 'react';
import { ErrorNote } from './error-note';

/** Keeps one failing data panel from blanking the whole screen. */
export class PanelBoundary extends Component<{ children: ReactNode }, { error: unknown }> {
  state = { error: null as unknown };
  static getDerivedStateFromError(error: unknown) {
    return { error };
  }
  render() {
    return this.state.error ? <ErrorNote error={this.state.error} /> : this.props.children;
  }
}
