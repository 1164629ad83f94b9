/** Withdrawing a certificate (unit or batch): a reason, and a plain warning of what happens. */
import { ReasonForm } from "@/components/ui/reason-form";
import { useWithdrawCertificate } from "../api/withdraw-certificate";

export function WithdrawForm({ workshopId, number, recipient, onDone }: { workshopId: string; number: string; recipient: string; onDone: () => void }) {
  const mutation = useWithdrawCertificate(workshopId);
  return (
    <ReasonForm
      name={`Withdraw certificate ${number}`}
      warning={`The certificate stays on record, but its verification page will say it was withdrawn, when and why, and its PDF will carry a WITHDRAWN mark. ${recipient} is told by e-mail. This cannot be undone.`}
      label="Why is it withdrawn?"
      hint="Shown on the public verification page: no names or contact details."
      submitLabel={`Withdraw ${number}`}
      onSubmit={async (reason) => {
        await mutation.mutateAsync({ number, reason });
        onDone();
      }}
      onCancel={onDone}
    />
  );
}
