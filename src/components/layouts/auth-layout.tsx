import type { ReactNode } from "react";
import { Wordmark } from "@/components/ui/wordmark";

/** Signed-out pages: one calm column, the form in a panel, a line about what Tinelog is for. */
export function AuthLayout({ title, intro, children, footer }: { title: string; intro?: ReactNode; children: ReactNode; footer?: ReactNode }) {
  return (
    <div className="min-h-dvh bg-canvas">
      <main className="mx-auto flex max-w-form flex-col gap-6 px-gutter py-10 sm:py-16">
        <Wordmark />
        <div className="rounded-panel border border-line bg-surface p-6 shadow-panel sm:p-8">
          <h1 className="text-heading font-semibold">{title}</h1>
          {intro ? <div className="mt-2 text-ink-soft">{intro}</div> : null}
          <div className="mt-6">{children}</div>
        </div>
        {footer ? <div className="text-center text-ink-soft">{footer}</div> : null}
        <p className="text-center text-caption text-ink-faint">Measured records of every tuned unit your workshop ships.</p>
      </main>
    </div>
  );
}
