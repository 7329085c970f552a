type SegmentedControlProps<V extends string> = {
  label: string;
  value: V;
  options: readonly { value: V; label: string; description?: string }[];
  onChange: (value: V) => void;
};

/** A row of toggle buttons for one choice (e.g. °F / °C); each segment is a ≥ 44 px touch target. */
export function SegmentedControl<V extends string>({ label, value, options, onChange }: SegmentedControlProps<V>) {
  return (
    <div role="group" aria-label={label} className="inline-flex rounded-lg border-2 border-line bg-surface p-0.5">
      {options.map((option) => {
        const isSelected = option.value === value;
        return (
          <button
            key={option.value}
            type="button"
            aria-pressed={isSelected}
            title={option.description}
            onClick={() => onChange(option.value)}
            className={`min-h-touch min-w-touch rounded-md px-3 text-lg font-bold transition-colors ${
              isSelected ? "bg-ink text-page" : "text-muted hover:text-ink"
            }`}
          >
            {option.label}
          </button>
        );
      })}
    </div>
  );
}
