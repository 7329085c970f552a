import { QueryErrorResetBoundary } from "@tanstack/react-query";
import { Component, type ReactNode } from "react";
import { ErrorMessage } from "./error-message";

type BoundaryProps = { children: ReactNode; onReset: () => void };
type BoundaryState = { error: unknown };

class Boundary extends Component<BoundaryProps, BoundaryState> {
  state: BoundaryState = { error: null };

  static getDerivedStateFromError(error: unknown): BoundaryState {
    return { error };
  }

  private readonly reset = () => {
    this.props.onReset();
    this.setState({ error: null });
  };

  render() {
    if (this.state.error === null) return this.props.children;
    return (
      <ErrorMessage
        error={this.state.error}
        action={
          <button
            type="button"
            onClick={this.reset}
            className="min-h-touch rounded-lg border-2 border-ink bg-ink px-4 text-lg font-semibold text-page"
          >
            Try again
          </button>
        }
      />
    );
  }
}

/** Keeps one broken panel (a chart, a list) from blanking the rest of the page (STYLE.md §3). */
export function PanelBoundary({ children }: { children: ReactNode }) {
  return <QueryErrorResetBoundary>{({ reset }) => <Boundary onReset={reset}>{children}</Boundary>}</QueryErrorResetBoundary>;
}
