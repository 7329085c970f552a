/**
 * A small Prometheus text-format registry (exposition format 0.0.4): counters with labels and
 * gauges read at scrape time. Enough for /metrics without another dependency.
 */
type Labels = Record<string, string>;

function labelText(labels: Labels): string {
  const parts = Object.entries(labels).map(([k, v]) => `${k}="${v.replaceAll("\\", "\\\\").replaceAll('"', '\\"').replaceAll("\n", "\\n")}"`);
  return parts.length ? `{${parts.join(",")}}` : "";
}

export class Counter {
  private readonly values = new Map<string, { labels: Labels; value: number }>();

  constructor(readonly name: string, readonly help: string) {}

  inc(labels: Labels = {}, by = 1): void {
    const key = labelText(labels);
    const entry = this.values.get(key) ?? { labels, value: 0 };
    entry.value += by;
    this.values.set(key, entry);
  }

  get(labels: Labels = {}): number {
    return this.values.get(labelText(labels))?.value ?? 0;
  }

  entries(): { labels: Labels; value: number }[] {
    return [...this.values.values()];
  }

  render(): string {
    const lines = [`# HELP ${this.name} ${this.help}`, `# TYPE ${this.name} counter`];
    if (this.values.size === 0) lines.push(`${this.name} 0`);
    for (const { labels, value } of this.values.values()) lines.push(`${this.name}${labelText(labels)} ${value}`);
    return lines.join("\n");
  }
}

export class Gauge {
  constructor(readonly name: string, readonly help: string, private readonly read: () => number) {}

  render(): string {
    return [`# HELP ${this.name} ${this.help}`, `# TYPE ${this.name} gauge`, `${this.name} ${this.read()}`].join("\n");
  }
}

export class Metrics {
  readonly readingsStored = new Counter("benchwarden_readings_stored_total", "Readings committed to the database");
  readonly readingsDuplicate = new Counter("benchwarden_readings_duplicate_total", "Re-sent readings already stored (skipped)");
  readonly readingsRejected = new Counter("benchwarden_readings_rejected_total", "Readings or packs refused at ingest, by reason");
  readonly mqttMessages = new Counter("benchwarden_mqtt_messages_total", "MQTT reading messages received");
  readonly writeBatches = new Counter("benchwarden_write_batches_total", "Ingest write transactions committed");
  readonly mailSent = new Counter("benchwarden_mail_sent_total", "E-mails accepted by the mail relay");
  readonly mailFailed = new Counter("benchwarden_mail_failed_attempts_total", "E-mail attempts that failed (retried later)");
  readonly alertTransitions = new Counter("benchwarden_alert_transitions_total", "Alert life-cycle steps, by kind and step");
  readonly mqttRefused = new Counter("benchwarden_mqtt_refused_total", "MQTT connections, publishes and subscriptions refused, by reason");
  private readonly gauges: Gauge[] = [];

  addGauge(name: string, help: string, read: () => number): void {
    this.gauges.push(new Gauge(name, help, read));
  }

  render(): string {
    const counters = [this.readingsStored, this.readingsDuplicate, this.readingsRejected, this.mqttMessages, this.writeBatches, this.mqttRefused, this.mailSent, this.mailFailed, this.alertTransitions];
    return [...counters.map((c) => c.render()), ...this.gauges.map((g) => g.render())].join("\n") + "\n";
  }
}
