import { useState } from "react";
import { PanelBoundary } from "../../../components/errors/panel-boundary";
import { buttonClasses } from "../../../components/ui/button";
import type { BenchChoices } from "../utils/describe-sensor";
import { RegisterSensorForm } from "./register-sensor-form";
import { SecretPanel, type RevealedSecret } from "./secret-panel";
import { SensorsTable } from "./sensors-table";

type SensorsAdminProps = { benchChoices: BenchChoices; onChanged?: () => void };

/**
 * The sensors page's content. It alone holds a just-made secret, in memory, until the admin
 * closes the panel; nothing else (cache, storage, URL) ever sees it.
 */
export function SensorsAdmin({ benchChoices, onChanged }: SensorsAdminProps) {
  const [revealed, setRevealed] = useState<RevealedSecret | null>(null);
  return (
    <div className="flex flex-col gap-10">
      <section aria-labelledby="sensors-list-heading">
        <div className="mb-3 flex flex-wrap items-center justify-between gap-3">
          <h2 id="sensors-list-heading" className="text-2xl font-bold">
            Registered sensors
          </h2>
          <a href="#sensors-register" className={buttonClasses("secondary")}>
            Register a sensor <span aria-hidden="true">↓</span>
          </a>
        </div>
        <PanelBoundary>
          <SensorsTable
            benchChoices={benchChoices}
            onRotated={(result) => setRevealed({ ...result, reason: "rotated" })}
            onChanged={onChanged}
          />
        </PanelBoundary>
      </section>
      <section id="sensors-register" aria-labelledby="sensors-register-heading" className="scroll-mt-32 rounded-2xl border-2 border-line bg-surface p-4 sm:p-6">
        <h2 id="sensors-register-heading" className="mb-1 text-2xl font-bold">
          Register a sensor
        </h2>
        <p className="mb-4 text-lg text-muted">Benchwarden makes a secret for the probe; you see it once, right after.</p>
        <RegisterSensorForm
          benchChoices={benchChoices}
          onRegistered={(result) => {
            setRevealed({ ...result, reason: "registered" });
            onChanged?.();
          }}
        />
      </section>
      {revealed && <SecretPanel revealed={revealed} onClose={() => setRevealed(null)} />}
    </div>
  );
}
