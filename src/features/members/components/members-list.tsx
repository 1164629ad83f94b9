import { useState } from "react";
import { roleLabels, roleNames, type RoleName } from "@shared/permissions";
import { Alert } from "@/components/ui/alert";
import { Badge, EmptyState } from "@/components/ui/panel";
import { Button } from "@/components/ui/button";
import { Spinner } from "@/components/ui/spinner";
import { useMembers, type Member } from "../api/get-members";
import { useRemoveMember } from "../api/remove-member";
import { useUpdateMemberRole } from "../api/update-member-role";

type Props = { workshopId: string; currentUserId: string; canManage: boolean };

export function MembersList({ workshopId, currentUserId, canManage }: Props) {
  const members = useMembers(workshopId);
  if (members.isPending) return <Spinner label="Loading members…" />;
  if (members.isError) return <Alert tone="error">{members.error.message}</Alert>;
  if (members.data.length === 0) return <EmptyState title="No members yet">Invite the people who make and check your units.</EmptyState>;

  return (
    <ul className="divide-y divide-line" aria-label="Members">
      {members.data.map((member) => (
        <MemberRow key={member.id} member={member} workshopId={workshopId} isSelf={member.userId === currentUserId} canManage={canManage} />
      ))}
    </ul>
  );
}

function MemberRow({ member, workshopId, isSelf, canManage }: { member: Member; workshopId: string; isSelf: boolean; canManage: boolean }) {
  const updateRole = useUpdateMemberRole(workshopId);
  const remove = useRemoveMember(workshopId);
  const [confirming, setConfirming] = useState(false);
  const error = updateRole.error ?? remove.error;
  const selectId = `role-${member.id}`;

  return (
    <li className="flex flex-col gap-3 py-4 sm:flex-row sm:items-center sm:justify-between">
      <div className="min-w-0">
        <p className="font-semibold text-ink">
          {member.user.name} {isSelf ? <Badge tone="steel">You</Badge> : null}
        </p>
        <p className="[overflow-wrap:anywhere] text-caption text-ink-soft">{member.user.email}</p>
        {error ? (
          <p role="alert" className="mt-1 text-caption text-rust-700">
            {error.message}
          </p>
        ) : updateRole.isSuccess ? (
          <p role="status" className="mt-1 text-caption text-moss-600">
            Role changed to {roleLabels[member.role] ?? member.role}.
          </p>
        ) : null}
      </div>
      <div className="flex flex-wrap items-center gap-2">
        {canManage ? (
          <>
            <label htmlFor={selectId} className="sr-only">
              Role of {member.user.name}
            </label>
            <select
              id={selectId}
              className="min-h-touch rounded-control border border-line-strong bg-surface px-2 text-body disabled:opacity-60"
              value={member.role}
              disabled={updateRole.isPending}
              onChange={(event) => updateRole.mutate({ memberId: member.id, role: event.target.value as RoleName })}
            >
              {roleNames.map((name) => (
                <option key={name} value={name}>
                  {roleLabels[name]}
                </option>
              ))}
            </select>
            {isSelf ? null : confirming ? (
              <span className="flex items-center gap-2">
                <Button variant="danger" pending={remove.isPending} onClick={() => remove.mutate(member.id)}>
                  Remove {member.user.name}
                </Button>
                <Button variant="quiet" onClick={() => setConfirming(false)}>
                  Keep
                </Button>
              </span>
            ) : (
              <Button variant="secondary" onClick={() => setConfirming(true)} aria-label={`Remove ${member.user.name} from the workshop`}>
                Remove…
              </Button>
            )}
          </>
        ) : (
          <Badge>{roleLabels[member.role] ?? member.role}</Badge>
        )}
      </div>
    </li>
  );
}
