import clsx from "clsx";

export function Spinner({ size = "md", label }: { size?: "sm" | "md"; label?: string }) {
  return (
    <span role={label ? "status" : undefined} className="inline-flex items-center gap-2">
      <span
        aria-hidden="true"
        className={clsx("inline-block animate-spin rounded-full border-2 border-current border-r-transparent", size === "sm" ? "size-4" : "size-6")}
      />
      {label ? <span className="text-ink-soft">{label}</span> : null}
    </span>
  );
}
