import { roleLabels } from "@shared/permissions";
import { Alert } from "@/components/ui/alert";
import { Badge, EmptyState } from "@/components/ui/panel";
import { Button } from "@/components/ui/button";
import { Spinner } from "@/components/ui/spinner";
import { formatDateTime } from "@/lib/format";
import { useCancelInvitation } from "../api/cancel-invitation";
import { useInvitations } from "../api/get-invitations";

export function PendingInvitations({ workshopId }: { workshopId: string }) {
  const invitations = useInvitations(workshopId);
  const cancel = useCancelInvitation(workshopId);

  if (invitations.isPending) return <Spinner label="Loading invitations…" />;
  if (invitations.isError) return <Alert tone="error">{invitations.error.message}</Alert>;
  if (invitations.data.length === 0) {
    return <EmptyState title="No invitations waiting">Invite someone with the form above; their invitation stays here until they accept it.</EmptyState>;
  }

  return (
    <>
      {cancel.error ? <Alert tone="error">{cancel.error.message}</Alert> : null}
      <ul className="divide-y divide-line" aria-label="Pending invitations">
        {invitations.data.map((invitation) => (
          <li key={invitation.id} className="flex flex-col gap-2 py-4 sm:flex-row sm:items-center sm:justify-between">
            <div className="min-w-0">
              <p className="[overflow-wrap:anywhere] font-semibold">{invitation.email}</p>
              <p className="text-caption text-ink-soft">
                <Badge tone="ochre">{roleLabels[invitation.role] ?? invitation.role}</Badge> · expires {formatDateTime(invitation.expiresAt)}
              </p>
            </div>
            <Button
              variant="secondary"
              pending={cancel.isPending && cancel.variables === invitation.id}
              onClick={() => cancel.mutate(invitation.id)}
              aria-label={`Cancel the invitation to ${invitation.email}`}
            >
              Cancel invitation
            </Button>
          </li>
        ))}
      </ul>
    </>
  );
}
