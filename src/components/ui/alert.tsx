import clsx from "clsx";
import type { ReactNode } from "react";

type Tone = "error" | "info" | "success" | "caution";

const tones: Record<Tone, string> = {
  error: "border-rust-300 bg-rust-50 text-rust-700",
  info: "border-steel-200 bg-steel-50 text-steel-800",
  success: "border-moss-300 bg-moss-50 text-moss-600",
  caution: "border-ochre-300 bg-ochre-50 text-ochre-600",
};

/** Errors are announced (role="alert"); other notes are polite status messages. */
export function Alert({ tone = "info", title, children, className }: { tone?: Tone; title?: string; children?: ReactNode; className?: string }) {
  return (
    <div role={tone === "error" ? "alert" : "status"} className={clsx("rounded-control border px-4 py-3 text-body", tones[tone], className)}>
      {title ? <p className="font-semibold">{title}</p> : null}
      {children ? <div className={title ? "mt-1" : undefined}>{children}</div> : null}
    </div>
  );
}
