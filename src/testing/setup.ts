import { cleanup } from "@testing-library/react";
import { afterEach, vi } from "vitest";

// vitest runs without globals, so Testing Library cannot register its own cleanup.
afterEach(() => {
  cleanup();
  window.localStorage.clear();
  vi.unstubAllGlobals();
  vi.useRealTimers();
});
