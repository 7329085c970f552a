import { useEffect, useRef, useState } from "react";
import { Button } from "./button";

type CopyState = "idle" | "copied" | "failed";

/**
 * Copies `text` to the clipboard. The Clipboard API exists only on HTTPS or localhost; a
 * greenhouse LAN often serves plain HTTP, so the fallback selects the text in `targetId` and
 * uses the older copy command; if both fail the text stays selected for a manual copy.
 */
export function CopyButton({ text, targetId, label = "Copy" }: { text: string; targetId: string; label?: string }) {
  const [state, setState] = useState<CopyState>("idle");
  const timer = useRef<number | undefined>(undefined);
  useEffect(() => () => window.clearTimeout(timer.current), []);

  async function copy() {
    let isCopied = false;
    try {
      if (navigator.clipboard && window.isSecureContext) {
        await navigator.clipboard.writeText(text);
        isCopied = true;
      }
    } catch {
      isCopied = false;
    }
    if (!isCopied) {
      const target = document.getElementById(targetId);
      if (target instanceof HTMLInputElement || target instanceof HTMLTextAreaElement) {
        target.focus();
        target.select();
      }
      try {
        isCopied = typeof document.execCommand === "function" && document.execCommand("copy");
      } catch {
        isCopied = false;
      }
    }
    setState(isCopied ? "copied" : "failed");
    window.clearTimeout(timer.current);
    timer.current = window.setTimeout(() => setState("idle"), 4_000);
  }

  return (
    <span className="inline-flex flex-col items-start gap-1">
      <Button variant="primary" onClick={() => void copy()}>
        {state === "copied" ? "Copied" : label}
      </Button>
      <span role="status" className="text-base text-muted">
        {state === "failed" ? "Could not copy here; the text is selected, copy it by hand." : ""}
      </span>
    </span>
  );
}
