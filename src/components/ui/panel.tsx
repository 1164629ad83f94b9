import clsx from "clsx";
import type { ReactNode } from "react";

export function Panel({ children, className, as: Tag = "section", ...rest }: { children: ReactNode; className?: string; as?: "section" | "div" | "article"; "aria-labelledby"?: string }) {
  return (
    <Tag className={clsx("rounded-panel border border-line bg-surface p-5 shadow-panel sm:p-6", className)} {...rest}>
      {children}
    </Tag>
  );
}

export function PageHeader({ title, description, actions }: { title: string; description?: ReactNode; actions?: ReactNode }) {
  return (
    <header className="mb-6 flex flex-wrap items-end justify-between gap-4">
      <div className="max-w-2xl">
        <h1 className="text-heading font-semibold text-ink">{title}</h1>
        {description ? <p className="mt-1 text-lead text-ink-soft">{description}</p> : null}
      </div>
      {actions ? <div className="flex flex-wrap gap-2">{actions}</div> : null}
    </header>
  );
}

/** Says what is (not) here and what to do next — never a blank area. */
export function EmptyState({ title, children, action }: { title: string; children?: ReactNode; action?: ReactNode }) {
  return (
    <div className="rounded-panel border border-dashed border-line-strong bg-canvas px-6 py-8 text-center">
      <p className="text-lead font-semibold text-ink">{title}</p>
      {children ? <div className="mx-auto mt-2 max-w-prose text-ink-soft">{children}</div> : null}
      {action ? <div className="mt-4 flex justify-center">{action}</div> : null}
    </div>
  );
}

export function Badge({ children, tone = "neutral" }: { children: ReactNode; tone?: "neutral" | "steel" | "ochre" | "rust" | "moss" }) {
  const tones = {
    neutral: "bg-sunken text-ink-soft",
    steel: "bg-steel-100 text-steel-800",
    ochre: "bg-ochre-50 text-ochre-600",
    rust: "bg-rust-50 text-rust-700",
    moss: "bg-moss-50 text-moss-600",
  } as const;
  return <span className={clsx("inline-flex items-center whitespace-nowrap rounded-full px-2.5 py-0.5 text-caption font-medium", tones[tone])}>{children}</span>;
}
