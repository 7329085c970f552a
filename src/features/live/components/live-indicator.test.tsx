import { act, render, screen } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import { LiveIndicator } from "./live-indicator";

describe("LiveIndicator", () => {
  afterEach(() => vi.restoreAllMocks());

  it("says Offline when the browser loses the network, whatever the stream thinks", () => {
    const onLine = vi.spyOn(navigator, "onLine", "get").mockReturnValue(true);
    render(<LiveIndicator state="live" />);
    expect(screen.getByRole("status").textContent).toBe("Live");
    onLine.mockReturnValue(false);
    act(() => void window.dispatchEvent(new Event("offline")));
    expect(screen.getByRole("status").textContent).toBe("Offline");
    onLine.mockReturnValue(true);
    act(() => void window.dispatchEvent(new Event("online")));
    expect(screen.getByRole("status").textContent).toBe("Live");
  });
});
