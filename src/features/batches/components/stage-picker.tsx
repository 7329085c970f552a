import { BATCH_STAGES, type BatchStage } from "../../../../shared/domain/batch.js";
import { STAGE_LABELS } from "../../../../shared/schemas/batches.js";

/** The stage as six large radio tiles (stuck … potted on, lost). */
export function StagePicker({ name, value, onChange, error }: { name: string; value: BatchStage; onChange: (stage: BatchStage) => void; error?: string }) {
  return (
    <fieldset className="flex flex-col gap-2" aria-describedby={error ? `${name}-error` : undefined}>
      <legend className="mb-1 text-lg font-semibold">Stage</legend>
      <div className="grid grid-cols-2 gap-2 sm:grid-cols-3">
        {BATCH_STAGES.map((stage) => (
          <label
            key={stage}
            className="flex min-h-14 cursor-pointer items-center gap-2 rounded-xl border-2 border-line bg-surface px-3 text-lg font-semibold has-[:checked]:border-ink has-[:checked]:bg-ink has-[:checked]:text-page has-[:focus-visible]:outline has-[:focus-visible]:outline-3 has-[:focus-visible]:outline-accent"
          >
            <input
              type="radio"
              name={name}
              value={stage}
              checked={value === stage}
              onChange={() => onChange(stage)}
              className="size-5 shrink-0 accent-[var(--bw-accent)]"
            />
            {STAGE_LABELS[stage]}
          </label>
        ))}
      </div>
      {error && (
        <p id={`${name}-error`} className="text-base font-semibold text-high">
          {error}
        </p>
      )}
    </fieldset>
  );
}
