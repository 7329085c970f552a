import { fireEvent, screen, waitFor, within } from "@testing-library/react";
import { beforeEach, describe, expect, it, vi } from "vitest";
import type { SensorView } from "../../../../shared/schemas/sensors.js";
import { NOW_MS, USERS, makeBench, makeSensor, makeSession, makeZone, makeZones } from "../../../testing/data";
import { createApiFake, problem } from "../../../testing/fakes";
import { FIRST_PAINT, ROUTE_TEST_TIMEOUT_MS, renderApp } from "../../../testing/render-app";

const SECRET = "s3cr3t-only-shown-once-Zx81Qw";
const ROTATED_SECRET = "n3w-s3cr3t-after-rotation-Kp02";

const ZONES = makeZones([
  makeZone({ id: 1, name: "Fig house", benches: [makeBench({ id: 1, name: "Bench 1" }), makeBench({ id: 2, name: "Bench 2", position: 2 })] }),
]);

function sensorsApi(initial: SensorView[] = [makeSensor({ id: "probe-1" })]) {
  const sensors = [...initial];
  return createApiFake({
    "GET /api/session": { body: makeSession(USERS.admin) },
    "GET /api/zones": { body: ZONES },
    "GET /api/sensors": () => ({ body: { sensors } }),
    "POST /api/sensors": ({ body }) => {
      const input = body as { id: string; kind: SensorView["kind"]; benchId: number | null };
      if (sensors.some((s) => s.id === input.id)) {
        return problem(409, "sensor-id-taken", `A sensor called ${input.id} already exists`, [{ path: "id", message: "This id is taken" }]);
      }
      const sensor = makeSensor({ ...input, benchName: input.benchId ? `Bench ${input.benchId}` : null, lastSeenMs: null, batteryPct: null });
      sensors.push(sensor);
      return { status: 201, body: { sensor, secret: SECRET } };
    },
    "POST /api/sensors/probe-1/secret": { body: { sensor: initial[0], secret: ROTATED_SECRET } },
    "PATCH /api/sensors/probe-1": ({ body }) => ({ body: { sensor: { ...sensors[0]!, ...(body as object), benchName: "Bench 2" } } }),
  });
}

const secretShown = (secret: string) => screen.queryAllByDisplayValue(secret).length + screen.queryAllByText(secret).length;

describe("sensors page", () => {
  beforeEach(() => vi.setSystemTime(NOW_MS + 30_000));

  it(
    "lists each sensor with its bench, kind, last seen, battery and status",
    async () => {
      const api = sensorsApi([
        makeSensor({ id: "probe-1", batteryPct: 12 }),
        makeSensor({ id: "probe-2", kind: "air", benchId: null, benchName: null, zoneName: null, lastSeenMs: null, batteryPct: null }),
        makeSensor({ id: "probe-3", disabled: true }),
      ]);
      renderApp("/sensors", api);
      const row = await screen.findByRole("row", { name: /probe-1/ }, FIRST_PAINT);
      expect(row.textContent).toContain("Fig house · Bench 1");
      expect(row.textContent).toContain("Air + medium probe");
      expect(row.textContent).toContain("1 min ago");
      expect(row.textContent).toContain("12 %, low");
      expect(row.textContent).toContain("Reporting");
      const unassigned = screen.getByRole("row", { name: /probe-2/ });
      expect(unassigned.textContent).toContain("Not on a bench");
      expect(unassigned.textContent).toContain("Never");
      expect(unassigned.textContent).toContain("No readings yet");
      const disabled = screen.getByRole("row", { name: /probe-3/ });
      expect(disabled.textContent).toContain("Disabled");
      expect(within(disabled).getByRole("button", { name: "Enable probe-3" })).toBeTruthy();
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "registering shows the secret once in a panel that only its own button closes; after closing it is gone",
    async () => {
      const api = sensorsApi();
      const app = renderApp("/sensors", api);
      await screen.findByRole("row", { name: /probe-1/ }, FIRST_PAINT);

      const form = screen.getByRole("form", { name: "Register a sensor" });
      fireEvent.change(within(form).getByLabelText("Sensor id"), { target: { value: " fig-bench-2-air " } });
      fireEvent.change(within(form).getByLabelText("Bench"), { target: { value: "2" } });
      fireEvent.click(within(form).getByRole("radio", { name: /Air probe/ }));
      fireEvent.click(within(form).getByRole("button", { name: "Register and make its secret" }));

      const panel = await screen.findByRole("dialog", { name: "fig-bench-2-air is registered" });
      expect(api.sent("POST /api/sensors")[0]?.body).toEqual({ id: "fig-bench-2-air", kind: "air", benchId: 2 });
      expect(within(panel).getByDisplayValue(SECRET)).toBeTruthy();
      expect(within(panel).getByText("Shown only this once")).toBeTruthy();
      expect(within(panel).getByText(/cannot show it again/)).toBeTruthy();
      expect(within(panel).getByRole("button", { name: "Copy secret" })).toBeTruthy();
      expect(secretShown(SECRET)).toBe(1);

      // A stray Escape or tap beside the panel does not lose the secret.
      fireEvent.keyDown(document, { key: "Escape" });
      expect(screen.getByRole("dialog")).toBeTruthy();

      fireEvent.click(within(panel).getByRole("button", { name: "I have stored it, close" }));
      expect(screen.queryByRole("dialog")).toBeNull();
      expect(secretShown(SECRET)).toBe(0);
      expect(document.body.innerHTML).not.toContain(SECRET);

      // The new sensor is in the list, without its secret; no cache kept a copy.
      expect(await screen.findByRole("row", { name: /fig-bench-2-air/ })).toBeTruthy();
      expect(document.body.innerHTML).not.toContain(SECRET);
      const cached = JSON.stringify([
        app.queryClient.getQueryCache().getAll().map((q) => q.state.data),
        app.queryClient.getMutationCache().getAll().map((m) => m.state.data),
      ]);
      expect(cached).not.toContain(SECRET);
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "checks the form with the shared schema, and puts the server's sensor-id-taken on the id field",
    async () => {
      const api = sensorsApi();
      renderApp("/sensors", api);
      await screen.findByRole("row", { name: /probe-1/ }, FIRST_PAINT);
      const form = screen.getByRole("form", { name: "Register a sensor" });
      const idField = within(form).getByLabelText("Sensor id");

      fireEvent.change(idField, { target: { value: "x" } });
      fireEvent.click(within(form).getByRole("button", { name: "Register and make its secret" }));
      expect(await within(form).findByText("Use at least 3 characters")).toBeTruthy();
      expect(api.sent("POST /api/sensors")).toHaveLength(0);

      fireEvent.change(idField, { target: { value: "probe-1" } });
      fireEvent.click(within(form).getByRole("button", { name: "Register and make its secret" }));
      expect(await within(form).findByText("This id is taken")).toBeTruthy();
      expect(idField.getAttribute("aria-invalid")).toBe("true");
      expect(screen.queryByRole("dialog")).toBeNull();
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "a new secret is made only after confirming, and shown once",
    async () => {
      const api = sensorsApi();
      renderApp("/sensors", api);
      const row = await screen.findByRole("row", { name: /probe-1/ }, FIRST_PAINT);

      fireEvent.click(within(row).getByRole("button", { name: "New secret for probe-1" }));
      const confirm = screen.getByRole("dialog", { name: "Make a new secret for probe-1?" });
      expect(confirm.textContent).toContain("stops working at once");
      fireEvent.click(within(confirm).getByRole("button", { name: "Cancel" }));
      expect(api.sent("POST /api/sensors/probe-1/secret")).toHaveLength(0);

      fireEvent.click(within(row).getByRole("button", { name: "New secret for probe-1" }));
      fireEvent.click(within(screen.getByRole("dialog")).getByRole("button", { name: "Make new secret" }));
      const panel = await screen.findByRole("dialog", { name: "New secret for probe-1" });
      expect(within(panel).getByDisplayValue(ROTATED_SECRET)).toBeTruthy();
      expect(panel.textContent).toContain("The old secret stopped working just now");
      expect(api.sent("POST /api/sensors/probe-1/secret")).toHaveLength(1);

      fireEvent.click(within(panel).getByRole("button", { name: "I have stored it, close" }));
      expect(document.body.innerHTML).not.toContain(ROTATED_SECRET);
    },
    ROUTE_TEST_TIMEOUT_MS,
  );

  it(
    "moves a sensor to another bench and disables it after confirming",
    async () => {
      const api = sensorsApi();
      renderApp("/sensors", api);
      const row = await screen.findByRole("row", { name: /probe-1/ }, FIRST_PAINT);

      fireEvent.click(within(row).getByRole("button", { name: "Move probe-1" }));
      const move = screen.getByRole("dialog", { name: "Move probe-1" });
      fireEvent.change(within(move).getByLabelText("Move to"), { target: { value: "2" } });
      fireEvent.click(within(move).getByRole("button", { name: "Move" }));
      expect(await screen.findByText("probe-1 moved to Fig house · Bench 2")).toBeTruthy();
      expect(api.sent("PATCH /api/sensors/probe-1")[0]?.body).toEqual({ benchId: 2 });

      fireEvent.click(within(row).getByRole("button", { name: "Disable probe-1" }));
      fireEvent.click(within(screen.getByRole("dialog", { name: "Disable probe-1?" })).getByRole("button", { name: "Disable" }));
      await waitFor(() => expect(api.sent("PATCH /api/sensors/probe-1")[1]?.body).toEqual({ disabled: true }));
    },
    ROUTE_TEST_TIMEOUT_MS,
  );
  it(
    "calibrates a probe: offsets typed in °F and % VWC are sent in °C and m³/m³, checked first with the shared schema",
    async () => {
      const api = sensorsApi();
      renderApp("/sensors", api);
      const row = await screen.findByRole("row", { name: /probe-1/ }, FIRST_PAINT);
      fireEvent.click(within(row).getByRole("button", { name: "Calibrate probe-1" }));
      const dialog = screen.getByRole("dialog", { name: "Calibrate probe-1" });
      const air = within(within(dialog).getByRole("group", { name: "Air temperature" }));
      const moisture = within(within(dialog).getByRole("group", { name: "Medium moisture" }));

      fireEvent.change(air.getByLabelText(/Offset \(°F\)/), { target: { value: "20" } });
      fireEvent.change(moisture.getByLabelText("Gain", { exact: false }), { target: { value: "abc" } });
      fireEvent.click(within(dialog).getByRole("button", { name: "Save calibration" }));
      expect(await within(dialog).findByText(/beyond ±5 °C \(9 °F\)/)).toBeTruthy();
      expect(within(dialog).getByText("Enter a number")).toBeTruthy();
      expect(api.sent("PATCH /api/sensors/probe-1")).toHaveLength(0);

      fireEvent.change(air.getByLabelText(/Offset \(°F\)/), { target: { value: "-0.9" } });
      fireEvent.change(moisture.getByLabelText(/Offset \(% VWC\)/), { target: { value: "2" } });
      fireEvent.change(moisture.getByLabelText("Gain", { exact: false }), { target: { value: "1.1" } });
      fireEvent.click(within(dialog).getByRole("button", { name: "Save calibration" }));
      await waitFor(() => expect(api.sent("PATCH /api/sensors/probe-1")).toHaveLength(1));
      const sent = api.sent("PATCH /api/sensors/probe-1")[0]?.body as { calibration: Record<string, { offset: number; gain: number }> };
      expect(sent.calibration["air.temperature"]!.offset).toBeCloseTo(-0.5, 10);
      expect(sent.calibration["medium.moisture"]).toEqual({ offset: 0.02, gain: 1.1 });
      expect(sent.calibration["air.humidity"]).toEqual({ offset: 0, gain: 1 });
      expect(await screen.findByText("Calibration of probe-1 saved: it applies to readings from now on")).toBeTruthy();
    },
    ROUTE_TEST_TIMEOUT_MS,
  );
});
