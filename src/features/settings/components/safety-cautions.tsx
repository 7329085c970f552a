/**
 * The cautions of PRODUCT.md §6, in our own words: Benchwarden watches and tells; it never
 * stands in for the protective devices and the licensed work a greenhouse needs.
 */
export function SafetyCautions() {
  return (
    <section aria-labelledby="cautions-heading" className="rounded-2xl border-2 border-high bg-high-soft p-4 sm:p-5">
      <h2 id="cautions-heading" className="flex items-center gap-2 text-xl font-bold">
        <span aria-hidden="true">⚠</span> Benchwarden is a monitor, not a safety device
      </h2>
      <p className="mt-2 text-lg">
        It reads probes and tells people when a bench leaves its window. It does not switch anything off, and it does not replace a heater&apos;s own high-limit cut-out, a
        carbon-monoxide alarm or ground-fault protection. A silent sensor, a network fault or a missed e-mail can delay a warning.
      </p>
      <ul className="mt-3 flex list-disc flex-col gap-1 pl-6 text-lg">
        <li>
          <strong>Heaters and heat mats in a wet greenhouse:</strong> use ground-fault protection (GFCI / RCD) on every circuit, have a qualified electrician install and check
          them, and follow your local electrical code.
        </li>
        <li>
          <strong>Fuel-burning heaters:</strong> fit carbon-monoxide alarms, and vent the heater as its maker and your local code require.
        </li>
        <li>
          <strong>Heater limits:</strong> keep each heater&apos;s and heat mat&apos;s own thermostat and high-limit cut-out in working order; a window set here does not control them.
        </li>
        <li>
          <strong>Perlite and peat dust:</strong> wet the mix before handling it and wear a dust mask.
        </li>
        <li>
          <strong>Rooting hormones and fungicides:</strong> follow the label for mixing, protective gear and re-entry.
        </li>
      </ul>
      <p className="mt-3 text-base">Where this page and a local code or a licensed professional differ, follow the code and the professional.</p>
    </section>
  );
}
