import { act, render, screen } from "@testing-library/react";
import { beforeEach, describe, expect, it, vi } from "vitest";
import { makeAlert } from "../../../testing/data";
import { FakeEventSource } from "../../../testing/fakes";
import { LiveIndicator } from "../components/live-indicator";
import { useReadingsStream } from "./use-readings-stream";

function StreamProbe(props: { onReadings: () => void; onReconnect: () => void; onAlerts?: () => void }) {
  const state = useReadingsStream(props);
  return <LiveIndicator state={state} />;
}

const READINGS = {
  readings: [{ benchId: 1, sensorId: "probe-1", quantity: "air.temperature", value: 20, timeMs: 1, status: "below" }],
};

describe("useReadingsStream", () => {
  beforeEach(() => {
    FakeEventSource.reset();
    vi.stubGlobal("EventSource", FakeEventSource);
  });

  it("shows Live once open and passes each valid readings event on", () => {
    const onReadings = vi.fn();
    render(<StreamProbe onReadings={onReadings} onReconnect={vi.fn()} />);
    expect(screen.getByRole("status").textContent).toBe("Connecting…");
    const source = FakeEventSource.latest();
    expect(source.url).toBe("/api/stream");

    act(() => source.open());
    expect(screen.getByRole("status").textContent).toBe("Live");

    act(() => source.emit("readings", READINGS));
    expect(onReadings).toHaveBeenCalledWith(READINGS);

    // Malformed events are dropped, not thrown.
    vi.spyOn(console, "warn").mockImplementation(() => {});
    act(() => source.emit("readings", "{not json"));
    act(() => source.emit("readings", { readings: [{ benchId: "x" }] }));
    expect(onReadings).toHaveBeenCalledTimes(1);
  });

  it("shows Reconnecting… after a drop, reopens a closed stream with back-off and reports the reconnect", async () => {
    vi.useFakeTimers();
    const onReconnect = vi.fn();
    render(<StreamProbe onReadings={vi.fn()} onReconnect={onReconnect} />);
    act(() => FakeEventSource.latest().open());

    act(() => FakeEventSource.latest().fail(FakeEventSource.CLOSED));
    expect(screen.getByRole("status").textContent).toBe("Reconnecting…");
    expect(FakeEventSource.instances).toHaveLength(1);

    await act(() => vi.advanceTimersByTimeAsync(1_000));
    expect(FakeEventSource.instances).toHaveLength(2);

    act(() => FakeEventSource.latest().open());
    expect(screen.getByRole("status").textContent).toBe("Live");
    expect(onReconnect).toHaveBeenCalledTimes(1);
  });

  it("passes each valid alerts event on and drops a malformed one", () => {
    const onAlerts = vi.fn();
    render(<StreamProbe onReadings={vi.fn()} onReconnect={vi.fn()} onAlerts={onAlerts} />);
    const source = FakeEventSource.latest();
    act(() => source.open());
    const event = { alerts: [makeAlert({ phase: "acknowledged", acknowledgedByName: "Marisol" })] };
    act(() => source.emit("alerts", event));
    expect(onAlerts).toHaveBeenCalledWith(event);
    vi.spyOn(console, "warn").mockImplementation(() => {});
    act(() => source.emit("alerts", { alerts: [{ id: "x" }] }));
    expect(onAlerts).toHaveBeenCalledTimes(1);
  });

  it("closes the stream when unmounted", () => {
    const view = render(<StreamProbe onReadings={vi.fn()} onReconnect={vi.fn()} />);
    const source = FakeEventSource.latest();
    view.unmount();
    expect(source.readyState).toBe(FakeEventSource.CLOSED);
  });
});
