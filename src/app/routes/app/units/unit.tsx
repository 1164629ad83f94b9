/**
 * The unit page: who it is for, uploading and recording strikes (states move on by polling), the
 * evaluation with tuning guidance, QA's disposition and the certificates.
 */
import type { QueryClient } from "@tanstack/react-query";
import { Link, useParams, type LoaderFunctionArgs } from "react-router";
import { can } from "@shared/permissions";
import { batchStateLabels } from "@shared/schemas/batch";
import { verdictWhy } from "@shared/verdict-why";
import { ButtonLink } from "@/components/ui/button";
import { PageHeader, Panel } from "@/components/ui/panel";
import { Spinner } from "@/components/ui/spinner";
import { VerdictBadge } from "@/components/ui/status-badges";
import { paths } from "@/config/paths";
import { CertificatesPanel } from "@/features/certificates/components/certificates-panel";
import { CompareStrikes } from "@/features/compare-strikes/components/compare-strikes";
import { getInstrumentsQueryOptions, useInstruments } from "@/features/instruments/api/get-instruments";
import { StrikeRecorder } from "@/features/recorder/components/strike-recorder";
import { getUnitQueryOptions, useUnit } from "@/features/units/api/get-unit";
import { DispositionsPanel } from "@/features/units/components/dispositions-panel";
import { EvaluationInstruments } from "@/features/units/components/evaluation-instruments";
import { EvaluationPanel } from "@/features/units/components/evaluation-view";
import { StrikeUpload } from "@/features/units/components/strike-upload";
import { StrikesList } from "@/features/units/components/strikes-list";
import { TuningGuidance } from "@/features/units/components/tuning-guidance";
import { UnitCustomerForm } from "@/features/units/components/unit-customer-form";
import { UnitHistory } from "@/features/units/components/unit-history";
import { assertCan } from "@/lib/authorization";
import { requireWorkshop } from "@/app/loaders";
import { useSignedInMe } from "@/app/use-signed-in-me";

export const unitLoader = (queryClient: QueryClient) => async ({ request, params }: LoaderFunctionArgs) => {
  const me = await requireWorkshop(queryClient, request);
  assertCan(me, "unit", "read", "reading units");
  await queryClient.ensureQueryData(getUnitQueryOptions(me.activeWorkshop.id, params.unitId ?? ""));
  // The upload's instrument choice needs the list at once (a remembered recorder is shown as chosen).
  if (can(me.activeWorkshop.role, "instrument", "read")) await queryClient.ensureQueryData(getInstrumentsQueryOptions(me.activeWorkshop.id));
  return null;
};

export function UnitRoute() {
  const me = useSignedInMe();
  const { unitId = "" } = useParams();
  const { id: workshopId, role } = me.activeWorkshop;
  const unit = useUnit(workshopId, unitId);
  const instruments = useInstruments(workshopId, can(role, "instrument", "read"));
  if (unit.isPending) return <Spinner label="Loading the unit…" />;
  if (unit.isError) throw unit.error;
  const u = unit.data;
  const released = u.batch.state === "released";
  const pending = u.strikes.some((s) => s.state === "queued" || s.state === "analysing");
  const canStrike = can(role, "strike", "create");
  const evaluation = u.evaluation;
  const why = evaluation ? verdictWhy(evaluation) : [];
  const blockedReason = !released
    ? `Certificates are issued once batch ${u.batch.code} is released (it is ${batchStateLabels[u.batch.state].toLowerCase()}).`
    : u.certification.reason;
  // The maker who uploaded a strike may void it; quality may void anyone's; never once released.
  const canVoid = (s: { uploadedBy: { id: string } | null }) =>
    !released && (can(role, "strike", "void-others") || (can(role, "strike", "void") && s.uploadedBy?.id === me.user.id));

  return (
    <>
      <nav aria-label="Breadcrumb" className="mb-4 flex flex-wrap items-center justify-between gap-3">
        <Link to={paths.app.batch.getHref(u.batch.id)} className="font-medium text-steel-700 underline underline-offset-2">
          ← Batch {u.batch.code}
        </Link>
        {u.nextUnit && u.nextUnit.id !== u.id && !released && canStrike ? (
          <ButtonLink to={paths.app.unit.getHref(u.nextUnit.id)} variant="secondary" size="sm">
            Next unit to measure: {u.nextUnit.serial} →
          </ButtonLink>
        ) : null}
      </nav>
      <PageHeader
        title={`Unit ${u.serial}`}
        description={
          <>
            <VerdictBadge verdict={evaluation?.verdict ?? null} />{" "}
            <span className="ml-1">
              Batch {u.batch.code} ({batchStateLabels[u.batch.state].toLowerCase()}) ·{" "}
              <Link to={paths.app.specification.getHref(u.spec.id)} className="underline underline-offset-2">
                {u.spec.name}
              </Link>
              , version {u.spec.version}
            </span>
            {why.length ? (
              <span className="mt-1 block text-body font-medium text-rust-700" aria-label="Why">
                {why.join(" · ")}
              </span>
            ) : null}
          </>
        }
      />

      <div className="flex flex-col gap-6">
        <Panel aria-labelledby="customer-heading">
          <h2 id="customer-heading" className="mb-3 text-title font-semibold">
            Customer
          </h2>
          <UnitCustomerForm key={`${u.customerName}|${u.customerEmail}`} workshopId={workshopId} unit={u} canEdit={can(role, "unit", "create")} />
        </Panel>

        {canStrike && !released ? (
          <Panel aria-labelledby="upload-heading">
            <h2 id="upload-heading" className="mb-3 text-title font-semibold">
              Record or upload strikes
            </h2>
            <StrikeUpload
              workshopId={workshopId}
              unitId={u.id}
              userId={me.user.id}
              instruments={instruments.data ?? []}
              recorder={(addFile, disabled) => <StrikeRecorder onRecorded={addFile} disabled={disabled} />}
            />
          </Panel>
        ) : null}

        <Panel aria-labelledby="strikes-heading">
          <h2 id="strikes-heading" className="mb-3 text-title font-semibold">
            Strikes
          </h2>
          <StrikesList unit={u} strikeHref={paths.strike.getHref} workshopId={workshopId} canVoid={canVoid} />
          <div className="mt-6">
            <CompareStrikes unit={u} />
          </div>
        </Panel>

        <Panel aria-labelledby="evaluation-heading">
          <h2 id="evaluation-heading" className="mb-3 text-title font-semibold">
            Evaluation
          </h2>
          <EvaluationPanel evaluation={evaluation} pending={pending} referenceTemperatureC={u.spec.referenceTemperatureC} />
          {evaluation ? (
            <div className="mt-4">
              <EvaluationInstruments workshopId={workshopId} unitId={u.id} evaluation={evaluation} strikes={u.strikes} canReevaluate={can(role, "evaluation", "create") && !released && !pending} />
            </div>
          ) : null}
        </Panel>

        {evaluation?.guidance && evaluation.verdict !== "within_tolerance" ? (
          <Panel aria-labelledby="guidance-heading">
            <h2 id="guidance-heading" className="mb-3 text-title font-semibold">
              Tuning guidance
            </h2>
            <TuningGuidance guidance={evaluation.guidance} />
          </Panel>
        ) : null}

        <Panel aria-labelledby="disposition-heading">
          <h2 id="disposition-heading" className="mb-3 text-title font-semibold">
            Disposition
          </h2>
          <DispositionsPanel workshopId={workshopId} unit={u} canDecide={can(role, "disposition", "create")} canSupersede={can(role, "disposition", "supersede")} />
        </Panel>

        <Panel aria-labelledby="certificates-heading">
          <h2 id="certificates-heading" className="mb-3 text-title font-semibold">
            Certificates
          </h2>
          <CertificatesPanel
            workshopId={workshopId}
            unitId={u.id}
            customer={{ name: u.customerName, email: u.customerEmail }}
            canIssue={can(role, "certificate", "issue")}
            canWithdraw={can(role, "certificate", "withdraw")}
            blockedReason={blockedReason}
            concession={u.certification.concession}
            released={released}
            settingsHref={can(role, "workshop", "update") ? paths.app.settings.getHref() : undefined}
          />
        </Panel>

        {can(role, "audit", "read") ? (
          <Panel aria-labelledby="history-heading">
            <h2 id="history-heading" className="mb-3 text-title font-semibold">
              History
            </h2>
            <UnitHistory workshopId={workshopId} unitId={u.id} revision={`${evaluation?.id ?? "none"}:${u.dispositions.length}:${u.strikes.filter((s) => s.voided).length}:${u.customerName ?? ""}:${u.customerEmail ?? ""}`} />
          </Panel>
        ) : null}
      </div>
    </>
  );
}
