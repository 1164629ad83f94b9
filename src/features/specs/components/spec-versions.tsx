/** Every version of a spec, newest first: its partials, who made it and when, and the change note. */
import { decisionRuleLabels, familyLabels, nominalTargetHz, type SpecDetail, type SpecPartial, type SpecVersion } from "@shared/schemas/spec";
import { describeTolerance, prettyNoteName } from "@shared/tuning";
import { Badge } from "@/components/ui/panel";
import { formatDateTime, formatNumber } from "@/lib/format";

export function SpecVersions({ spec }: { spec: SpecDetail }) {
  return (
    <ol className="flex flex-col gap-5" aria-label="Versions">
      {spec.versions.map((version) => (
        <li key={version.id}>
          <VersionCard version={version} current={version.version === spec.currentVersion} />
        </li>
      ))}
    </ol>
  );
}

function VersionCard({ version, current }: { version: SpecVersion; current: boolean }) {
  return (
    <article aria-labelledby={`v-${version.id}`} className="rounded-control border border-line bg-canvas p-4">
      <header className="flex flex-wrap items-baseline justify-between gap-2">
        <h3 id={`v-${version.id}`} className="text-lead font-semibold">
          Version {version.version} {current ? <Badge tone="steel">Current</Badge> : null}
        </h3>
        <p className="text-caption text-ink-soft">
          {version.createdBy?.name ?? "Unknown"} · {formatDateTime(version.createdAt)}
        </p>
      </header>
      {version.changeNote ? <p className="mt-1 text-ink-soft">“{version.changeNote}”</p> : null}
      <dl className="mt-3 grid grid-cols-2 gap-x-4 gap-y-1 text-caption sm:grid-cols-4">
        <dt className="text-ink-faint">Family</dt>
        <dd>{familyLabels[version.family]}</dd>
        <dt className="text-ink-faint">Reference temperature</dt>
        <dd>{version.referenceTemperatureC} °C</dd>
        <dt className="text-ink-faint">Temperature coefficient</dt>
        <dd>{formatCoefficient(version.tempCoefficientPerC)}</dd>
        <dt className="text-ink-faint">Reference pitch</dt>
        <dd>A4 = {version.referencePitchHz} Hz</dd>
        <dt className="text-ink-faint">Strikes per unit</dt>
        <dd>{version.strikesRequired}</dd>
        <dt className="text-ink-faint">Decision rule</dt>
        <dd className="col-span-3">{decisionRuleLabels[version.decisionRule]}</dd>
        {version.lengthMm != null ? (
          <>
            <dt className="text-ink-faint">Vibrating length</dt>
            <dd>{version.lengthMm} mm</dd>
          </>
        ) : null}
      </dl>
      <div className="mt-3 overflow-x-auto">
        <table className="w-full text-left text-caption">
          <caption className="sr-only">Partials of version {version.version}</caption>
          <thead className="border-b border-line text-ink-soft">
            <tr>
              {["Label", "Target", "Tolerance", "Min T60", "Min Q", "Max beat", "Required"].map((h) => (
                <th key={h} scope="col" className="py-1.5 pr-3 font-semibold">
                  {h}
                </th>
              ))}
            </tr>
          </thead>
          <tbody className="divide-y divide-line">
            {version.partials.map((p) => (
              <tr key={p.label} className="align-top">
                <td className="py-1.5 pr-3 font-medium">
                  {p.label} {p.isFundamental && p.label.trim().toLowerCase() !== "fundamental" ? <Badge>Fundamental</Badge> : null}
                </td>
                <td className="py-1.5 pr-3 tabular-nums">
                  <Target p={p} referencePitchHz={version.referencePitchHz} />
                </td>
                <td className="py-1.5 pr-3 tabular-nums">{describeTolerance(p.toleranceCents, nominalTargetHz(p, fundamentalHz(version)), p.toleranceUnit, p.toleranceValue)}</td>
                <td className="py-1.5 pr-3 tabular-nums">{p.minT60S != null ? `${p.minT60S} s` : "—"}</td>
                <td className="py-1.5 pr-3 tabular-nums">{p.minQ ?? "—"}</td>
                <td className="py-1.5 pr-3 tabular-nums">{p.maxBeatHz != null ? `${p.maxBeatHz} Hz` : "—"}</td>
                <td className="py-1.5 pr-3">{p.required ? "Yes" : "Optional"}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </article>
  );
}

function fundamentalHz(v: SpecVersion): number | null {
  return v.partials.find((p) => p.isFundamental)?.targetHz ?? null;
}

/** "C5 · 523.251 Hz", "strike note C5 · 523.251 Hz", "2.757 × f₁". */
function Target({ p, referencePitchHz }: { p: SpecPartial; referencePitchHz: number }) {
  if (p.targetKind === "ratio") return <>{formatNumber(p.ratio, 3)} × f₁</>;
  return (
    <>
      {p.targetKind === "strike_note" ? "strike note " : ""}
      {p.targetNote ? `${prettyNoteName(p.targetNote)} · ` : ""}
      {formatNumber(p.targetHz, 3)} Hz
      {p.targetNote ? <span className="block text-ink-faint">at A4 = {referencePitchHz} Hz</span> : null}
    </>
  );
}

/** −0.0001 per °C reads better as −100 ppm/°C; both are shown so neither has to be converted. */
function formatCoefficient(perC: number): string {
  const ppm = perC * 1e6;
  const minus = (x: string) => x.replace("-", "\u2212");
  return `${minus(String(Number(ppm.toFixed(2))))} ppm/°C (${minus(String(perC))} per °C)`;
}
