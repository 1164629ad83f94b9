/** Moving a batch on: open → in review (anyone who makes batches) → released (qa, owner). */
import { useState } from "react";
import { can, type RoleName } from "@shared/permissions";
import type { BatchDetail } from "@shared/schemas/batch";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { formatDateTime } from "@/lib/format";
import { useMarkInReview, useReleaseBatch } from "../api/change-batch-state";

export function BatchActions({ workshopId, batch, role }: { workshopId: string; batch: BatchDetail; role: RoleName }) {
  const review = useMarkInReview(workshopId, batch.id);
  const release = useReleaseBatch(workshopId, batch.id);
  const [confirming, setConfirming] = useState(false);
  const error = review.error ?? release.error;
  const open = batch.rows.filter((row) => row.open).length;

  if (batch.state === "released") {
    return (
      <Alert tone="success" title={`Released ${batch.releasedAt ? formatDateTime(batch.releasedAt) : ""}`}>
        {batch.releasedBy ? `By ${batch.releasedBy.name}. ` : ""}No more strikes can be added; certificates are issued below, or from each unit's page.
      </Alert>
    );
  }

  return (
    <div className="flex flex-col gap-3">
      {error ? (
        <Alert tone="error" title={release.isError ? "The batch was not released" : "The batch was not moved to review"}>
          {error.message}
        </Alert>
      ) : null}
      <div className="flex flex-wrap items-center gap-2">
        {batch.state === "open" && can(role, "batch", "create") ? (
          <Button variant="secondary" pending={review.isPending} onClick={() => review.mutate()}>
            Mark in review
          </Button>
        ) : null}
        {can(role, "batch", "release") ? (
          confirming ? (
            <>
              <Button
                pending={release.isPending}
                onClick={() => {
                  setConfirming(false);
                  release.mutate();
                }}
              >
                Release {batch.code} now
              </Button>
              <Button variant="quiet" onClick={() => setConfirming(false)}>
                Not yet
              </Button>
            </>
          ) : (
            <Button variant={open === 0 ? "primary" : "secondary"} onClick={() => setConfirming(true)}>
              Release batch…
            </Button>
          )
        ) : null}
      </div>
      <p className="text-caption text-ink-soft">
        {open === 0
          ? "Every unit has a verdict and every nonconforming unit a disposition: the batch can be released."
          : `${open} unit${open === 1 ? " is" : "s are"} still open (not measured, not decided, or awaiting a disposition). Release is refused until none is.`}
        {confirming ? " Releasing closes the batch for good: no more strikes, dispositions or units." : ""}
      </p>
    </div>
  );
}
