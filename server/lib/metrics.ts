import client from "prom-client";

/**
 * Operator metrics in the Prometheus text format, through prom-client. Each server instance has
 * its own registry (tests run several in one process). Counters also keep their values for
 * synchronous reads in tests and logs: prom-client's own `get()` is asynchronous.
 */
type Labels = Record<string, string>;

export class Counter {
  private readonly values = new Map<string, { labels: Labels; value: number }>();
  private readonly counter: client.Counter<string>;

  constructor(registry: client.Registry, name: string, help: string, labelNames: string[] = []) {
    this.counter = new client.Counter({ name, help, labelNames, registers: [registry] });
  }

  inc(labels: Labels = {}, by = 1): void {
    if (by === 0) return;
    this.counter.inc(labels, by);
    const key = JSON.stringify(Object.entries(labels).sort());
    const entry = this.values.get(key) ?? { labels, value: 0 };
    entry.value += by;
    this.values.set(key, entry);
  }

  get(labels: Labels = {}): number {
    return this.values.get(JSON.stringify(Object.entries(labels).sort()))?.value ?? 0;
  }

  entries(): { labels: Labels; value: number }[] {
    return [...this.values.values()];
  }
}

export class Metrics {
  readonly registry = new client.Registry();
  readonly readingsStored = new Counter(this.registry, "benchwarden_readings_stored_total", "Readings committed to the database");
  readonly readingsDuplicate = new Counter(this.registry, "benchwarden_readings_duplicate_total", "Re-sent readings already stored (skipped)");
  readonly readingsRejected = new Counter(this.registry, "benchwarden_readings_rejected_total", "Readings or packs refused at ingest, by reason", ["reason"]);
  readonly mqttMessages = new Counter(this.registry, "benchwarden_mqtt_messages_total", "MQTT reading messages received");
  readonly writeBatches = new Counter(this.registry, "benchwarden_write_batches_total", "Ingest write transactions committed");
  readonly mqttRefused = new Counter(this.registry, "benchwarden_mqtt_refused_total", "MQTT connections, publishes and subscriptions refused or slowed, by reason", ["reason"]);
  readonly mailSent = new Counter(this.registry, "benchwarden_mail_sent_total", "E-mails accepted by the mail relay");
  readonly mailFailed = new Counter(this.registry, "benchwarden_mail_failed_attempts_total", "E-mail attempts that failed (retried later)");
  readonly alertTransitions = new Counter(this.registry, "benchwarden_alert_transitions_total", "Alert life-cycle steps, by kind and step", ["kind", "step"]);
  readonly retentionDeleted = new Counter(this.registry, "benchwarden_retention_deleted_readings_total", "Raw readings deleted by retention (their rollups are kept)");
  readonly retentionChunkSeconds = new client.Histogram({
    name: "benchwarden_retention_chunk_seconds",
    help: "Time one retention transaction held the database writer",
    buckets: [0.001, 0.005, 0.01, 0.025, 0.05, 0.1, 0.25, 0.5, 1],
    registers: [this.registry],
  });
  readonly batchRows = new client.Histogram({
    name: "benchwarden_ingest_batch_rows",
    help: "Readings per ingest transaction",
    buckets: [1, 5, 20, 100, 500, 1000, 5000],
    registers: [this.registry],
  });
  readonly batchCommitSeconds = new client.Histogram({
    name: "benchwarden_ingest_commit_seconds",
    help: "Time to write and commit one ingest transaction",
    buckets: [0.0005, 0.001, 0.005, 0.01, 0.05, 0.1, 0.5, 1],
    registers: [this.registry],
  });

  constructor() {
    client.collectDefaultMetrics({ register: this.registry, prefix: "benchwarden_" });
  }

  /** A gauge read at scrape time (sync or async), optionally by label. */
  addGauge(name: string, help: string, read: () => number | Promise<number> | Promise<{ labels: Labels; value: number }[]>, labelNames: string[] = []): void {
    new client.Gauge({
      name,
      help,
      labelNames,
      registers: [this.registry],
      async collect() {
        const value = await read();
        this.reset();
        if (typeof value === "number") this.set(value);
        else for (const v of value) this.set(v.labels, v.value);
      },
    });
  }

  render(): Promise<string> {
    return this.registry.metrics();
  }

  get contentType(): string {
    return this.registry.contentType;
  }
}
