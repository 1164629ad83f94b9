import type { QueryClient } from "@tanstack/react-query";
import { useParams, type LoaderFunctionArgs } from "react-router";
import { Spinner } from "@/components/ui/spinner";
import { Wordmark } from "@/components/ui/wordmark";
import { getVerificationQueryOptions, useVerification } from "@/features/verification/api/get-verification";
import { VerificationNotFound, VerificationView } from "@/features/verification/components/verification-view";

export const verifyLoader = (queryClient: QueryClient) => async ({ params }: LoaderFunctionArgs) => {
  await queryClient.ensureQueryData(getVerificationQueryOptions(params.code ?? ""));
  return null;
};

/** Public: no sign-in, nothing of the customer's contact data (the API gives none). */
export function VerifyRoute() {
  const { code = "" } = useParams();
  const verification = useVerification(code);
  if (verification.isError) throw verification.error;
  return (
    <main className="mx-auto flex min-h-dvh max-w-2xl flex-col gap-6 px-4 py-6 sm:px-gutter sm:py-10">
      <Wordmark />
      <div className="rounded-panel border border-line bg-surface p-5 shadow-panel sm:p-6">
        {verification.isPending ? <Spinner label="Checking the certificate…" /> : verification.data.found ? <VerificationView v={verification.data} /> : <VerificationNotFound />}
      </div>
      <p className="text-caption text-ink-faint">
        This page shows what the certificate states and whether it is genuine. It is open to anyone holding the link and shows no contact details.
      </p>
    </main>
  );
}
