import { readingsFromPayload } from "../../shared/domain/sensor-readings.js";
import type { Logger } from "../lib/logger.js";
import type { Metrics } from "../lib/metrics.js";
import type { ReadingWriter } from "../modules/readings/reading-writer.js";
import type { SensorsService } from "../modules/sensors/sensors.service.js";

export interface IngestDeps {
  sensors: SensorsService;
  writer: ReadingWriter;
  metrics: Metrics;
  logger: Logger;
  now?: () => number;
}

/**
 * The MQTT entry point for readings, as a route is for HTTP: parse and validate the SenML pack
 * with the shared resolver, count and log what is refused, hand the good readings to the writer.
 * Resolves once the good readings are committed (or there were none); never throws for bad input.
 */
export function createIngest({ sensors, writer, metrics, logger, now = Date.now }: IngestDeps) {
  return async function ingestReadings(sensorId: string, payload: Buffer): Promise<void> {
    metrics.mqttMessages.inc();
    const profile = await sensors.ingestProfile(sensorId);
    if (profile === undefined) {
      metrics.readingsRejected.inc({ reason: "unknown-sensor" });
      logger.warn({ sensorId }, "reading from an unknown sensor refused");
      return;
    }
    const { benchId, calibration } = profile;
    const result = readingsFromPayload(payload.toString("utf8"), { nowMs: now(), calibration });
    if (!result.ok) {
      metrics.readingsRejected.inc({ reason: result.reason });
      logger.warn({ sensorId, reason: result.reason, detail: result.detail }, "SenML pack refused");
      return;
    }
    for (const r of result.rejected) {
      metrics.readingsRejected.inc({ reason: r.reason });
      logger.warn({ sensorId, record: r.index, reason: r.reason, detail: r.detail }, "SenML record refused");
    }
    await writer.enqueue(result.readings.map((r) => ({ sensorId, benchId, quantity: r.quantity, timeMs: r.timeMs, value: r.value })));
  };
}

export type IngestReadings = ReturnType<typeof createIngest>;
