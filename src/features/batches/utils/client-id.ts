/**
 * A UUID (v4) made on the device for a new observation, so re-sending it never stores it twice.
 * crypto.randomUUID exists only on HTTPS or localhost, and a greenhouse LAN often serves plain
 * HTTP; crypto.getRandomValues works on both (RFC 9562 §5.4 layout).
 */
export function makeClientId(): string {
  if (typeof crypto.randomUUID === "function" && window.isSecureContext) return crypto.randomUUID();
  const b = crypto.getRandomValues(new Uint8Array(16));
  b[6] = (b[6]! & 0x0f) | 0x40;
  b[8] = (b[8]! & 0x3f) | 0x80;
  const hex = Array.from(b, (x) => x.toString(16).padStart(2, "0")).join("");
  return `${hex.slice(0, 8)}-${hex.slice(8, 12)}-${hex.slice(12, 16)}-${hex.slice(16, 20)}-${hex.slice(20)}`;
}
