import { readFile } from "node:fs/promises";
import { z } from "zod";
import { sensorKindSchema, type SensorKind } from "../shared/schemas/quantities.js";

/** One entry of demo-sensors.json (PRODUCT.md §4, Demo mode), or an admin's export of the same shape. */
export const sensorCredentialSchema = z.object({
  id: z.string().min(1),
  secret: z.string(),
  benchId: z.union([z.number(), z.string().min(1)]),
  benchName: z.string(),
  kind: sensorKindSchema,
});
export type SensorCredential = z.infer<typeof sensorCredentialSchema>;

export const credentialsFileSchema = z.array(sensorCredentialSchema).min(1, "the file lists no sensors");

/** A sensor the simulator plays. */
export interface SimSensor {
  id: string;
  secret: string;
  /** MQTT client id: the sensor id, suffixed for extra copies played for load. */
  clientId: string;
  kind: SensorKind;
  /** Index into the fleet's benches. */
  bench: number;
}

export interface SimBench {
  id: string;
  name: string;
}

export interface Fleet {
  benches: SimBench[];
  sensors: SimSensor[];
  /** True when the sensors were made up (no credentials file). */
  synthetic: boolean;
}

export async function loadCredentials(path: string): Promise<SensorCredential[]> {
  let text: string;
  try {
    text = await readFile(path, "utf8");
  } catch (err) {
    throw new Error(`cannot read credentials file ${path}: ${(err as Error).message}`, { cause: err });
  }
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (err) {
    throw new Error(`credentials file ${path} is not JSON: ${(err as Error).message}`, { cause: err });
  }
  const parsed = credentialsFileSchema.safeParse(json);
  if (!parsed.success) {
    const issues = parsed.error.issues.map((i) => `${i.path.join(".") || "(file)"}: ${i.message}`).join("; ");
    throw new Error(`credentials file ${path} is not a list of { id, secret, benchId, benchName, kind }: ${issues}`);
  }
  return parsed.data;
}

/**
 * The fleet to play from a credentials list: `count` sensors (default: one per entry). Beyond
 * the list's length the entries are reused in turn, with the same id and secret (only those
 * authenticate) and a distinct client id; their readings land on the same sensor and bench, which
 * is what a load test wants.
 */
export function fleetFromCredentials(credentials: readonly SensorCredential[], count = credentials.length): Fleet {
  const benches: SimBench[] = [];
  const benchIndex = new Map<string, number>();
  const sensors: SimSensor[] = [];
  for (let i = 0; i < count; i += 1) {
    const c = credentials[i % credentials.length] as SensorCredential;
    const copy = Math.floor(i / credentials.length);
    const key = String(c.benchId);
    if (!benchIndex.has(key)) {
      benchIndex.set(key, benches.length);
      benches.push({ id: key, name: c.benchName || `Bench ${key}` });
    }
    sensors.push({
      id: c.id,
      secret: c.secret,
      clientId: copy === 0 ? c.id : `${c.id}~${copy}`,
      kind: c.kind,
      bench: benchIndex.get(key) ?? 0,
    });
  }
  return { benches, sensors, synthetic: false };
}

/**
 * A made-up fleet for an open broker (tests, benchmarks): an air probe and a medium probe per
 * bench, ids `sim-0001`…, secret "sim".
 */
export function syntheticFleet(count: number): Fleet {
  const benchCount = Math.max(1, Math.ceil(count / 2));
  const benches: SimBench[] = Array.from({ length: benchCount }, (_, i) => ({
    id: String(i + 1),
    name: `Sim bench ${i + 1}`,
  }));
  const width = Math.max(4, String(count).length);
  const sensors: SimSensor[] = Array.from({ length: count }, (_, i) => {
    const id = `sim-${String(i + 1).padStart(width, "0")}`;
    return { id, secret: "sim", clientId: id, kind: i % 2 === 0 ? "air" : "medium", bench: Math.floor(i / 2) };
  });
  return { benches, sensors, synthetic: true };
}
