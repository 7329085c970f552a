import { cleanup, configure } from "@testing-library/react";
import { afterEach, vi } from "vitest";

// npm test runs the web project beside the server suites on two cores; findBy*'s default 1 s
// wait is too short under that load and made tests fail by timing alone.
configure({ asyncUtilTimeout: 5000 });

// vitest runs without globals, so Testing Library cannot register its own cleanup.
afterEach(() => {
  cleanup();
  window.localStorage.clear();
  vi.unstubAllGlobals();
  vi.useRealTimers();
});
