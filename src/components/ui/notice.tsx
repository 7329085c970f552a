import type { ReactNode } from "react";

export type NoticeTone = "info" | "success" | "warning" | "error";

const TONES: Record<NoticeTone, string> = {
  info: "border-accent bg-surface",
  success: "border-ok bg-ok-soft",
  warning: "border-high bg-high-soft",
  error: "border-high bg-high-soft",
};

type NoticeProps = { tone?: NoticeTone; title?: string; children?: ReactNode; className?: string; id?: string };

/**
 * A boxed message in a form or page. Errors are announced at once (role="alert"); the others
 * politely (role="status").
 */
export function Notice({ tone = "info", title, children, className = "", id }: NoticeProps) {
  return (
    <div
      id={id}
      role={tone === "error" ? "alert" : "status"}
      data-tone={tone}
      className={`rounded-xl border-2 p-4 text-lg text-ink ${TONES[tone]} ${className}`}
    >
      {title && <p className="font-bold">{title}</p>}
      {children && <div className={title ? "mt-1" : ""}>{children}</div>}
    </div>
  );
}
