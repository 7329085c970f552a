import type { ObservationView } from "../../../../shared/schemas/batches.js";
import { FLAG_LABELS, STAGE_LABELS } from "../../../../shared/schemas/batches.js";

/** One stored observation: stage, counts, flags, note, who, and its photos as thumbnails (tap for the full photo). */
export function ObservationLine({ observation, subject }: { observation: ObservationView; subject: string }) {
  const counts = [
    observation.rootedCount !== null ? `${observation.rootedCount} rooted so far` : null,
    observation.lostCount !== null ? `${observation.lostCount} lost so far` : null,
  ].filter(Boolean);
  return (
    <div className="flex flex-col gap-2">
      <p className="flex flex-wrap items-center gap-x-2 gap-y-1 text-lg">
        <span className="font-bold">{STAGE_LABELS[observation.stage]}</span>
        {counts.length > 0 && <span>· {counts.join(", ")}</span>}
        <span className="text-base text-muted">· {observation.recordedBy.name}</span>
      </p>
      {observation.flags.length > 0 && (
        <ul className="flex flex-wrap gap-1.5" aria-label="Flags">
          {observation.flags.map((flag) => (
            <li key={flag} className="rounded-full border-2 border-high bg-high-soft px-2.5 py-0.5 text-base font-bold text-ink">
              {FLAG_LABELS[flag]}
            </li>
          ))}
        </ul>
      )}
      {observation.note && <p className="text-lg">“{observation.note}”</p>}
      {observation.photos.length > 0 && (
        <ul className="flex flex-wrap gap-2" aria-label="Photos">
          {observation.photos.map((photo, i) => (
            <li key={photo.id}>
              <a href={photo.url} target="_blank" rel="noreferrer" className="block rounded-lg focus-visible:outline-3">
                <img
                  src={photo.thumbnailUrl}
                  width={photo.thumbnailWidth}
                  height={photo.thumbnailHeight}
                  loading="lazy"
                  alt={`Photo ${i + 1} of ${subject}, ${observation.observedOn}`}
                  className="h-24 w-auto rounded-lg border-2 border-line object-cover"
                />
              </a>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
