import { HORMONE_CAUTION } from "../../../../shared/schemas/batches.js";

/** The cautions of PRODUCT.md §6 that go with handling cuttings and their medium: short and plain. */
export function HandlingCautions({ showHormone = true }: { showHormone?: boolean }) {
  return (
    <aside aria-label="Cautions" className="rounded-xl border-2 border-high bg-high-soft p-3 text-base">
      <ul className="flex flex-col gap-1">
        {showHormone && (
          <li>
            <span aria-hidden="true">⚠ </span>
            {HORMONE_CAUTION}
          </li>
        )}
        <li>
          <span aria-hidden="true">⚠ </span>Perlite and peat dust: wet the mix before handling it and wear a dust mask.
        </li>
      </ul>
    </aside>
  );
}
