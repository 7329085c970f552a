import { QueryClientProvider, type QueryClient } from "@tanstack/react-query";
import { Component, type ReactNode } from "react";
import { ErrorMessage } from "../components/errors/error-message";
import { ToastProvider } from "../components/ui/toast";
import { TemperatureUnitProvider } from "../lib/temperature-unit";
import { OfflineWork } from "./offline-work";

type AppProviderProps = { queryClient: QueryClient; children: ReactNode };

/**
 * App-wide context. The unit here is this browser's default; the signed-in layout puts the
 * user's own preference over it (app/routes/root.tsx). The session itself is restored by the
 * signed-in layout's loader (app/session-guard.ts).
 */
export function AppProvider({ queryClient, children }: AppProviderProps) {
  return (
    <TopErrorBoundary>
      <QueryClientProvider client={queryClient}>
        <TemperatureUnitProvider>
          <ToastProvider>
            {/* Observations and check-offs entered offline wait on the tablet (app/offline-work.tsx). */}
            <OfflineWork queryClient={queryClient}>{children}</OfflineWork>
          </ToastProvider>
        </TemperatureUnitProvider>
      </QueryClientProvider>
    </TopErrorBoundary>
  );
}

/** The last line: anything the routes' own boundaries did not catch. */
class TopErrorBoundary extends Component<{ children: ReactNode }, { error: unknown }> {
  state = { error: null as unknown };

  static getDerivedStateFromError(error: unknown) {
    return { error };
  }

  render() {
    if (this.state.error === null) return this.props.children;
    return (
      <div className="mx-auto max-w-2xl p-6">
        <ErrorMessage
          error={this.state.error}
          action={
            <button
              type="button"
              onClick={() => window.location.reload()}
              className="min-h-touch rounded-lg border-2 border-ink bg-ink px-4 text-lg font-semibold text-page"
            >
              Reload
            </button>
          }
        />
      </div>
    );
  }
}
