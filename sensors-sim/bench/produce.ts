/**
 * How fast the model and the payload builder alone produce readings (no network):
 * `npx tsx --tsconfig tsconfig.server.json sensors-sim/bench/produce.ts [sensors] [seconds]`.
 */
import { syntheticFleet } from "../credentials.js";
import { World } from "../model/world.js";
import { buildReadingPack, encodePack } from "../payload/senml.js";

export function measureProduction(sensors: number, seconds: number, speed = 60, intervalS = 5) {
  const fleet = syntheticFleet(sensors);
  const world = new World({
    seed: 1,
    startHour: 0,
    scenario: "normal",
    benches: fleet.benches,
    sensors: fleet.sensors.map((s) => ({ id: s.id, kind: s.kind, bench: s.bench })),
  });
  const started = performance.now();
  let readings = 0;
  let bytes = 0;
  let k = 0;
  while (performance.now() - started < seconds * 1000) {
    for (let s = 0; s < sensors; s += 1) {
      const simS = ((s / sensors + k) * intervalS * speed);
      const out = world.sample(s, simS);
      if (out.type !== "reading") continue;
      const pack = buildReadingPack(fleet.sensors[s]?.id ?? "", [{ timeMs: Date.now(), values: out.values }]);
      bytes += encodePack(pack).length;
      readings += pack.length;
    }
    k += 1;
  }
  const elapsed = (performance.now() - started) / 1000;
  return { readingsPerSecond: readings / elapsed, packsPerSecond: (k * sensors) / elapsed, bytesPerPack: bytes / (k * sensors) };
}

if (import.meta.url === `file://${process.argv[1]}`) {
  const sensors = Number(process.argv[2] ?? 2000);
  const seconds = Number(process.argv[3] ?? 5);
  const r = measureProduction(sensors, seconds);
  console.log(
    `${sensors} sensors: ${Math.round(r.packsPerSecond)} packs/s, ${Math.round(r.readingsPerSecond)} readings/s, ${Math.round(r.bytesPerPack)} bytes/pack (model + SenML, no network)`,
  );
}
