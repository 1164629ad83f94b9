/** Tinelog's mark: two tines on a stem, with one ring of sound. Drawn here, not borrowed. */
export function Wordmark({ className }: { className?: string }) {
  return (
    <span className={`inline-flex items-center gap-2 font-semibold tracking-tight text-ink ${className ?? ""}`}>
      <svg viewBox="0 0 24 24" className="size-7 text-steel-600" aria-hidden="true" fill="none" stroke="currentColor" strokeWidth="2" strokeLinecap="round">
        <path d="M8 3v8a4 4 0 0 0 8 0V3" />
        <path d="M12 15v6" />
        <path d="M19.5 6.5a6 6 0 0 1 0 5" className="text-steel-300" stroke="currentColor" />
      </svg>
      <span className="text-title">Tinelog</span>
    </span>
  );
}
