import type { ReactNode } from "react";
import { Link } from "react-router";
import { familyLabels } from "@shared/schemas/spec";
import { Alert } from "@/components/ui/alert";
import { EmptyState } from "@/components/ui/panel";
import { Spinner } from "@/components/ui/spinner";
import { formatDateTime } from "@/lib/format";
import { useSpecs } from "../api/get-specs";

type Props = { workshopId: string; specHref: (id: string) => string; emptyAction?: ReactNode };

export function SpecsList({ workshopId, specHref, emptyAction }: Props) {
  const specs = useSpecs(workshopId);
  if (specs.isPending) return <Spinner label="Loading specifications…" />;
  if (specs.isError) return <Alert tone="error">{specs.error.message}</Alert>;
  if (specs.data.length === 0) {
    return (
      <EmptyState title="No specifications yet" action={emptyAction}>
        A specification sets the target pitch, overtone ratios, tolerances and decay limits a product must meet. Batches are made under one; start
        from a family template.
      </EmptyState>
    );
  }
  return (
    <div className="overflow-x-auto">
      <table className="w-full text-left">
        <caption className="sr-only">Specifications</caption>
        <thead className="border-b border-line text-caption text-ink-soft">
          <tr>
            <th scope="col" className="py-2 pr-4 font-semibold">Name</th>
            <th scope="col" className="py-2 pr-4 font-semibold">Family</th>
            <th scope="col" className="py-2 pr-4 font-semibold">Version</th>
            <th scope="col" className="py-2 pr-4 font-semibold">Batches</th>
            <th scope="col" className="py-2 font-semibold">Last changed</th>
          </tr>
        </thead>
        <tbody className="divide-y divide-line">
          {specs.data.map((spec) => (
            <tr key={spec.id}>
              <td className="py-3 pr-4">
                <Link to={specHref(spec.id)} className="font-semibold text-steel-700 underline underline-offset-2">
                  {spec.name}
                </Link>
              </td>
              <td className="py-3 pr-4">{familyLabels[spec.family]}</td>
              <td className="py-3 pr-4 tabular-nums">v{spec.currentVersion}</td>
              <td className="py-3 pr-4 tabular-nums">{spec.batches}</td>
              <td className="py-3 text-ink-soft">{formatDateTime(spec.updatedAt)}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
