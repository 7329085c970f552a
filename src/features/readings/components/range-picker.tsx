import { useState, type FormEvent } from "react";
import { Button } from "../../../components/ui/button";
import { TextField } from "../../../components/ui/form";
import { SegmentedControl } from "../../../components/ui/segmented-control";
import { RANGE_CHOICES, customRangeProblem, rangeBounds, toDateInputValue, type ChartRange } from "../utils/chart-range";

type RangeChoice = (typeof RANGE_CHOICES)[number]["value"];

type RangePickerProps = { range: ChartRange; onChange: (range: ChartRange) => void };

/** 24 h / 7 d / 30 d, or two dates; each choice a ≥ 44 px target for a tablet. */
export function RangePicker({ range, onChange }: RangePickerProps) {
  const [isChoosingDates, setIsChoosingDates] = useState(range.kind === "custom");
  const selected: RangeChoice = isChoosingDates ? "custom" : range.kind;

  return (
    <div className="flex flex-col gap-3">
      <SegmentedControl
        label="Time range"
        value={selected}
        options={RANGE_CHOICES}
        onChange={(choice) => {
          if (choice === "custom") {
            setIsChoosingDates(true);
            return;
          }
          setIsChoosingDates(false);
          onChange({ kind: choice });
        }}
      />
      {isChoosingDates && <CustomRangeForm range={range} onChange={onChange} />}
    </div>
  );
}

function CustomRangeForm({ range, onChange }: RangePickerProps) {
  const initial = (() => {
    if (range.kind === "custom") return { from: range.from, to: range.to };
    const { fromMs, toMs } = rangeBounds(range, Date.now());
    return { from: toDateInputValue(fromMs), to: toDateInputValue(toMs) };
  })();
  const [from, setFrom] = useState(initial.from);
  const [to, setTo] = useState(initial.to);
  const [problem, setProblem] = useState<ReturnType<typeof customRangeProblem>>(null);

  function onSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const found = customRangeProblem(from, to);
    setProblem(found);
    if (!found) onChange({ kind: "custom", from, to });
  }

  return (
    <form onSubmit={onSubmit} noValidate aria-label="Choose dates" className="flex flex-wrap items-end gap-3">
      <TextField
        label="First day"
        type="date"
        value={from}
        max={toDateInputValue(Date.now())}
        onChange={(e) => {
          setFrom(e.target.value);
          setProblem(null);
        }}
        error={problem?.field === "from" ? problem.message : undefined}
        className="w-48"
      />
      <TextField
        label="Last day"
        type="date"
        value={to}
        max={toDateInputValue(Date.now())}
        onChange={(e) => {
          setTo(e.target.value);
          setProblem(null);
        }}
        error={problem?.field === "to" ? problem.message : undefined}
        className="w-48"
      />
      <Button type="submit" variant="primary">
        Show these days
      </Button>
    </form>
  );
}
