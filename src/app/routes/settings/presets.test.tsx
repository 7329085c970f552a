import { fireEvent, screen, waitFor, within } from "@testing-library/react";
import { beforeEach, describe, expect, it, vi } from "vitest";
import type { WindowPresetInput } from "../../../../shared/schemas/windows.js";
import { NOW_MS, USERS, makeSession, makeZones } from "../../../testing/data";
import { createApiFake } from "../../../testing/fakes";
import { FIRST_PAINT, ROUTE_TEST_TIMEOUT_MS, renderApp } from "../../../testing/render-app";
import { AIR_MIN_WARNING, PRESETS } from "./settings-fixtures";

function presetsApi() {
  return createApiFake({
    "GET /api/session": { body: makeSession(USERS.manager) },
    "GET /api/zones": { body: makeZones() },
    "GET /api/window-presets": { body: { presets: PRESETS } },
    // The server's answer: on a dry run the would-be preset (no id yet) and the warning for an air minimum below 21 °C.
    "POST /api/window-presets": ({ body, search }) => {
      const input = body as WindowPresetInput;
      const dryRun = search.includes("dryRun=true");
      const warnings = input.windows.some((w) => w.quantity === "air.temperature" && w.min < 21) ? [AIR_MIN_WARNING] : [];
      const preset = { ...PRESETS[0]!, ...input, id: dryRun ? null : "12", builtIn: false, notes: [], createdAtMs: dryRun ? null : NOW_MS, updatedAtMs: dryRun ? null : NOW_MS };
      return { status: dryRun ? 200 : 201, body: { preset, warnings, dryRun, changed: true } };
    },
  });
}

describe("window presets", () => {
  beforeEach(() => vi.setSystemTime(NOW_MS + 30_000));

  it(
    "a copy of a built-in preset with a cool air minimum shows the server's guidance warning from a dry run before it is created",
    async () => {
      const api = presetsApi();
      renderApp("/settings/presets", api);
      const card = await screen.findByRole("article", { name: /Warm rooting/ }, FIRST_PAINT);
      expect(within(card).queryByRole("button", { name: /Delete/ })).toBeNull(); // built in: no delete, no edit
      fireEvent.click(within(card).getByRole("button", { name: "Copy to a new preset" }));
      const form = screen.getByRole("form", { name: "Preset" });
      expect((within(form).getByLabelText("Name") as HTMLInputElement).value).toBe("Warm rooting (copy)");
      fireEvent.change(within(form).getByLabelText("Name"), { target: { value: "Hardening, cool nights" } });
      const air = within(form).getByRole("group", { name: "Air temperature" });
      fireEvent.change(within(air).getByLabelText(/^Minimum \(°F\)/), { target: { value: "62" } });
      fireEvent.click(within(form).getByRole("button", { name: "Check and create" }));

      const review = await screen.findByRole("region", { name: /Check before saving/ });
      expect(review.textContent).toContain("An air minimum below about 70 °F (21 °C)");
      // The source is cited for people; our notes' file names are not shown.
      expect(review.textContent).not.toContain("REFERENCES.md");
      // Only the dry run so far.
      expect(api.sent("POST /api/window-presets").map((r) => r.search)).toEqual(["?dryRun=true"]);
      fireEvent.click(within(review).getByRole("button", { name: "Save anyway" }));
      await waitFor(() => expect(api.sent("POST /api/window-presets")).toHaveLength(2));
      expect(api.sent("POST /api/window-presets")[1]!.search).toBe("");
      const sent = api.sent("POST /api/window-presets")[1]!.body as WindowPresetInput;
      expect(sent.name).toBe("Hardening, cool nights");
      expect(sent.windows[0]!.min).toBeCloseTo((62 - 32) / 1.8, 10);
      expect(await screen.findByText("Preset “Hardening, cool nights” created")).toBeTruthy();
    },
    ROUTE_TEST_TIMEOUT_MS,
  );
});
