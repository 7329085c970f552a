import type { TemperatureUnit } from "../../../shared/domain/units.js";
import { useTemperatureUnit } from "../../lib/temperature-unit";
import { SegmentedControl } from "../ui/segmented-control";

const OPTIONS = [
  { value: "F", label: "°F", description: "Show temperatures in degrees Fahrenheit" },
  { value: "C", label: "°C", description: "Show temperatures in degrees Celsius" },
] as const satisfies readonly { value: TemperatureUnit; label: string; description: string }[];

export function TemperatureUnitSwitch() {
  const { unit, setUnit } = useTemperatureUnit();
  return <SegmentedControl label="Temperature unit" value={unit} options={OPTIONS} onChange={setUnit} />;
}
