export type TextPart = { kind: "text"; text: string } | { kind: "link"; href: string };

// http(s) addresses only: a mail's text must never turn into a javascript: or data: link.
const URL_PATTERN = /https?:\/\/[^\s<>"'()]+/g;
// Punctuation that ends a sentence after an address belongs to the sentence, not the address.
const TRAILING_PUNCTUATION = /[.,;:!?]+$/;

/** Splits plain mail text into text and the web addresses in it, so the addresses can be links. */
export function splitLinks(text: string): TextPart[] {
  const parts: TextPart[] = [];
  let last = 0;
  for (const match of text.matchAll(URL_PATTERN)) {
    const start = match.index;
    const href = match[0].replace(TRAILING_PUNCTUATION, "");
    if (start > last) parts.push({ kind: "text", text: text.slice(last, start) });
    parts.push({ kind: "link", href });
    last = start + href.length;
  }
  if (last < text.length) parts.push({ kind: "text", text: text.slice(last) });
  return parts;
}
