/** Tinelog's mark: a fork's two tines on a stem, with two rings of sound beside it. Drawn here, not borrowed. */
export function Wordmark({ className }: { className?: string }) {
  return (
    <span className={`inline-flex items-center gap-2.5 font-semibold tracking-tight text-ink ${className ?? ""}`}>
      <svg viewBox="0 0 32 32" className="size-8" aria-hidden="true" fill="none" strokeLinecap="round" strokeLinejoin="round">
        <rect x="0.5" y="0.5" width="31" height="31" rx="8" className="fill-steel-600" />
        <path d="M10 7v8.5a4 4 0 0 0 8 0V7" stroke="white" strokeWidth="2.4" />
        <path d="M14 19.5V26" stroke="white" strokeWidth="2.4" />
        <path d="M21.5 10.5a5.5 5.5 0 0 1 0 6" stroke="#a9cfd2" strokeWidth="1.8" />
        <path d="M24.5 8.5a9 9 0 0 1 0 10" stroke="#78b0b5" strokeWidth="1.8" />
      </svg>
      <span className="text-title">Tinelog</span>
    </span>
  );
}
