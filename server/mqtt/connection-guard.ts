import { Transform, type TransformCallback } from "node:stream";

export interface ConnectionGuardOptions {
  /** Largest MQTT packet accepted (fixed header included), bytes. */
  maxPacketBytes: number;
  /** Sustained bytes per second one connection may send; bursts up to `burstBytes`. */
  bytesPerSecond: number;
  burstBytes: number;
  /** Called once when a packet over the limit arrives; the connection is then closed. */
  onOversized?: (bytes: number) => void;
  /** Called when the connection is being held back by the rate limit. */
  onThrottled?: () => void;
}

/**
 * Sits between a sensor's socket and the broker. aedes has no packet-size limit (MQTT allows
 * 256 MB), so this reads each packet's fixed header (MQTT 3.1.1 §2.2: a type byte, then the
 * remaining length as 1–4 bytes of 7 bits) and closes the connection at the first packet over
 * the limit, before buffering it. It also meters bytes with a token bucket: a flooding client is
 * slowed by TCP back-pressure (its data is passed on later), so it cannot starve the others.
 */
export class ConnectionGuard extends Transform {
  private headerBytes: number[] = [];
  private remainingInPacket = 0;
  private tokens: number;
  private lastRefillMs = Date.now();

  constructor(private readonly options: ConnectionGuardOptions) {
    super();
    this.tokens = options.burstBytes;
  }

  override _transform(chunk: Buffer, _enc: BufferEncoding, callback: TransformCallback): void {
    if (!this.checkSizes(chunk)) {
      callback(new Error("MQTT packet over the size limit"));
      return;
    }
    this.refill();
    if (this.tokens >= chunk.length) {
      this.tokens -= chunk.length;
      callback(null, chunk);
      return;
    }
    // Over the rate: hold this chunk until the bucket has refilled enough for it.
    this.options.onThrottled?.();
    const waitMs = Math.ceil(((chunk.length - this.tokens) / this.options.bytesPerSecond) * 1000);
    setTimeout(() => {
      this.refill();
      this.tokens = Math.max(0, this.tokens - chunk.length);
      callback(null, chunk);
    }, waitMs);
  }

  private refill(): void {
    const now = Date.now();
    this.tokens = Math.min(this.options.burstBytes, this.tokens + ((now - this.lastRefillMs) / 1000) * this.options.bytesPerSecond);
    this.lastRefillMs = now;
  }

  /** Walks packet boundaries through the chunk; false when a packet declares itself too large. */
  private checkSizes(chunk: Buffer): boolean {
    let i = 0;
    while (i < chunk.length) {
      if (this.remainingInPacket > 0) {
        const skip = Math.min(this.remainingInPacket, chunk.length - i);
        this.remainingInPacket -= skip;
        i += skip;
        continue;
      }
      this.headerBytes.push(chunk[i]!);
      i++;
      // headerBytes[0] is the type byte; then up to four length bytes, the last without bit 7.
      if (this.headerBytes.length < 2) continue;
      const last = this.headerBytes[this.headerBytes.length - 1]!;
      if (last & 0x80) {
        if (this.headerBytes.length > 5) return false; // malformed length
        continue;
      }
      let remaining = 0;
      for (let k = this.headerBytes.length - 1; k >= 1; k--) remaining = remaining * 128 + (this.headerBytes[k]! & 0x7f);
      const total = this.headerBytes.length + remaining;
      this.headerBytes = [];
      if (total > this.options.maxPacketBytes) {
        this.options.onOversized?.(total);
        return false;
      }
      this.remainingInPacket = remaining;
    }
    return true;
  }
}
