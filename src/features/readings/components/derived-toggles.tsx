export type DerivedChoice = { dewPoint: boolean; vpd: boolean };

const TOGGLES = [
  { key: "dewPoint", label: "Dew point", description: "Show the dew point, worked out from air temperature and humidity" },
  { key: "vpd", label: "VPD", description: "Show the vapour-pressure deficit, worked out from air temperature and humidity" },
] as const;

/** On/off buttons for the derived lines; each a ≥ 44 px target that says whether it is on. */
export function DerivedToggles({ value, onChange }: { value: DerivedChoice; onChange: (next: DerivedChoice) => void }) {
  return (
    <div role="group" aria-label="Derived lines" className="flex flex-wrap items-center gap-2">
      <span className="text-base font-semibold text-muted">Also show</span>
      {TOGGLES.map((toggle) => {
        const isOn = value[toggle.key];
        return (
          <button
            key={toggle.key}
            type="button"
            aria-pressed={isOn}
            title={toggle.description}
            onClick={() => onChange({ ...value, [toggle.key]: !isOn })}
            className={`inline-flex min-h-touch min-w-touch items-center gap-2 rounded-lg border-2 px-3 text-lg font-semibold ${
              isOn ? "border-ink bg-ink text-page" : "border-line bg-surface text-ink hover:border-accent"
            }`}
          >
            <span aria-hidden="true">{isOn ? "✓" : "+"}</span>
            {toggle.label}
          </button>
        );
      })}
    </div>
  );
}
