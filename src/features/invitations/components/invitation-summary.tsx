import { roleLabels } from "@shared/permissions";
import type { PublicInvitation } from "../api/get-invitation";

export function InvitationSummary({ invitation }: { invitation: PublicInvitation }) {
  return (
    <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 rounded-control bg-steel-50 px-4 py-3 text-body">
      <dt className="text-ink-soft">Workshop</dt>
      <dd>{invitation.workshopName}</dd>
      <dt className="text-ink-soft">Role</dt>
      <dd>{roleLabels[invitation.role] ?? invitation.role}</dd>
    </dl>
  );
}
