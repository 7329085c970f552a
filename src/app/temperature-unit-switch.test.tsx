import { fireEvent, render, screen } from "@testing-library/react";
import { MemoryRouter } from "react-router-dom";
import { describe, expect, it } from "vitest";
import { BenchCard } from "../features/zones/components/bench-card";
import { TEMPERATURE_UNIT_STORAGE_KEY, TemperatureUnitProvider, useTemperatureUnit } from "../lib/temperature-unit";
import { NOW_MS, makeBench, reading } from "../testing/data";
import { TemperatureUnitSwitch } from "../components/layouts/temperature-unit-switch";

function CardInChosenUnit() {
  const { unit } = useTemperatureUnit();
  const bench = makeBench({ status: "below", latest: [reading("air.temperature", 16, "below")] });
  return <BenchCard bench={bench} unit={unit} nowMs={NOW_MS} />;
}

function renderApp() {
  return render(
    <MemoryRouter>
      <TemperatureUnitProvider>
        <TemperatureUnitSwitch />
        <CardInChosenUnit />
      </TemperatureUnitProvider>
    </MemoryRouter>,
  );
}

const airText = () => screen.getByRole("group", { name: "Air temperature" }).textContent ?? "";

describe("TemperatureUnitSwitch", () => {
  it("starts in °F, switches the shown value to °C and remembers the choice", () => {
    const first = renderApp();
    expect(airText()).toContain("60.8 °F");
    expect(screen.getByRole("button", { name: "°F" }).getAttribute("aria-pressed")).toBe("true");

    fireEvent.click(screen.getByRole("button", { name: "°C" }));

    expect(airText()).toContain("16.0 °C");
    expect(airText()).not.toContain("°F");
    expect(screen.getByRole("button", { name: "°C" }).getAttribute("aria-pressed")).toBe("true");
    expect(window.localStorage.getItem(TEMPERATURE_UNIT_STORAGE_KEY)).toBe("C");

    // A new visit reads the stored choice.
    first.unmount();
    renderApp();
    expect(airText()).toContain("16.0 °C");
  });

  it("ignores a stored value that is not a unit", () => {
    window.localStorage.setItem(TEMPERATURE_UNIT_STORAGE_KEY, "kelvin");
    renderApp();
    expect(airText()).toContain("60.8 °F");
  });

  it("gives every segment a touch target of at least 44 px", () => {
    renderApp();
    for (const name of ["°F", "°C"]) {
      const className = screen.getByRole("button", { name }).className;
      expect(className).toContain("min-h-touch");
      expect(className).toContain("min-w-touch");
    }
  });
});
