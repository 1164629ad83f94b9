const FLOOR_DB = -72;

/** Position (0…1) of a level on the meter's dB scale from −72 dBFS to 0 dBFS. */
const pos = (db: number) => Math.max(0, Math.min(1, (db - FLOOR_DB) / -FLOOR_DB));

/** Input level: RMS as the solid bar, peak as the tick; rust once anything has clipped. */
export function LevelMeter({ peakDb, rmsDb, clipped }: { peakDb: number; rmsDb: number; clipped: boolean }) {
  const hot = peakDb > -6;
  return (
    <div className="flex flex-col gap-1">
      <div
        role="meter"
        aria-label="Input level"
        aria-valuemin={FLOOR_DB}
        aria-valuemax={0}
        aria-valuenow={Math.round(Math.max(FLOOR_DB, peakDb))}
        aria-valuetext={`peak ${peakDb <= -159 ? "silence" : `${peakDb.toFixed(0)} dBFS`}${clipped ? ", clipped" : ""}`}
        className="relative h-5 w-full overflow-hidden rounded-control border border-line-strong bg-sunken"
      >
        <div className={`absolute inset-y-0 left-0 ${clipped ? "bg-rust-600" : hot ? "bg-ochre-600" : "bg-steel-500"}`} style={{ width: `${pos(rmsDb) * 100}%` }} />
        <div className={`absolute inset-y-0 w-0.5 ${clipped ? "bg-rust-700" : "bg-ink"}`} style={{ left: `calc(${pos(peakDb) * 100}% - 1px)` }} />
        {/* Scale marks every 12 dB. */}
        {[-60, -48, -36, -24, -12].map((m) => (
          <div key={m} className="absolute inset-y-0 w-px bg-line-strong/70" style={{ left: `${pos(m) * 100}%` }} aria-hidden="true" />
        ))}
      </div>
      <div className="relative h-4 font-mono text-[0.75rem] text-ink-faint" aria-hidden="true">
        {[-72, -48, -24, -12, 0].map((m) => (
          <span key={m} className="absolute -translate-x-1/2 whitespace-nowrap first:translate-x-0 last:-translate-x-full" style={{ left: `${pos(m) * 100}%` }}>
            {m === 0 ? "0 dBFS" : `\u2212${-m}`}
          </span>
        ))}
      </div>
    </div>
  );
}
