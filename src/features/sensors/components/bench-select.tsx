import type { ComponentProps } from "react";
import { SelectField } from "../../../components/ui/form";
import type { BenchChoices } from "../utils/describe-sensor";

export const NO_BENCH = "";

type BenchSelectProps = Omit<ComponentProps<typeof SelectField>, "children"> & { choices: BenchChoices };

/** Every bench by zone, plus "not on a bench". The value is the bench id as text ("" for none). */
export function BenchSelect({ choices, ...props }: BenchSelectProps) {
  return (
    <SelectField {...props}>
      <option value={NO_BENCH}>Not on a bench</option>
      {choices.map((zone) => (
        <optgroup key={zone.zoneName} label={zone.zoneName}>
          {zone.benches.map((bench) => (
            <option key={bench.id} value={String(bench.id)}>
              {bench.name}
            </option>
          ))}
        </optgroup>
      ))}
    </SelectField>
  );
}

export function benchIdFromValue(value: string): number | null {
  return value === NO_BENCH ? null : Number(value);
}
