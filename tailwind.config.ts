import type { Config } from "tailwindcss";

// Loaded by Tailwind 4 through `@config` in src/index.css. Colours point at CSS variables
// (defined there, with a dark set for the night shift) so one class works in both schemes.
// The palette is Benchwarden's own: a calm green for "in window", deep blue for "below",
// brick for "above", slate for "no reading"; every status also carries a word and an icon.
export default {
  content: ["./index.html", "./src/**/*.{ts,tsx}"],
  theme: {
    extend: {
      fontFamily: {
        sans: ['"Source Sans 3"', "ui-sans-serif", "system-ui", "sans-serif"],
      },
      colors: {
        page: "var(--bw-page)",
        surface: "var(--bw-surface)",
        ink: "var(--bw-ink)",
        muted: "var(--bw-muted)",
        line: "var(--bw-line)",
        accent: "var(--bw-accent)",
        ok: { DEFAULT: "var(--bw-ok)", soft: "var(--bw-ok-soft)" },
        low: { DEFAULT: "var(--bw-low)", soft: "var(--bw-low-soft)" },
        high: { DEFAULT: "var(--bw-high)", soft: "var(--bw-high-soft)" },
        none: { DEFAULT: "var(--bw-none)", soft: "var(--bw-none-soft)" },
        "on-status": "var(--bw-on-status)",
      },
      minHeight: { touch: "44px" },
      minWidth: { touch: "44px" },
    },
  },
} satisfies Config;
