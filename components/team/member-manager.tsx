"use client";
// The lab lead's member table: each member's role with a select and Save, and Remove behind a
// confirmation; what each change did (or why it was refused) is said in one live region above.
import { useRef, useState, useTransition } from "react";
import { Button } from "@/components/ui/button";
import { ConfirmDialog } from "@/components/ui/confirm-dialog";
import { FormMessage } from "@/components/ui/form-message";
import { ROLE_LABELS, TEAM_ROLES, type TeamRole } from "@/lib/auth/roles";
import type { TeamMember } from "@/lib/services/team-members";
import type { FormState } from "@/lib/validation/form-state";
import { TableScroll } from "@/components/ui/table-scroll";

type Action = (state: FormState, formData: FormData) => Promise<FormState>;

export function MemberManager({
  teamId,
  teamName,
  members,
  currentUserId,
  changeRoleAction,
  removeAction,
}: {
  teamId: string;
  teamName: string;
  members: TeamMember[];
  currentUserId: string;
  changeRoleAction: Action;
  removeAction: Action;
}) {
  const [result, setResult] = useState<FormState>({});
  /** The member whose role change was just refused: their select points at the message. */
  const [refusedUserId, setRefusedUserId] = useState<string | null>(null);
  const [removing, setRemoving] = useState<TeamMember | null>(null);
  const [pending, startTransition] = useTransition();
  const opener = useRef<HTMLElement | null>(null);
  const heading = useRef<HTMLHeadingElement>(null);

  const run = (
    action: Action,
    fields: Record<string, string>,
    after?: (outcome: FormState) => void,
  ) => {
    const formData = new FormData();
    for (const [name, value] of Object.entries(fields)) formData.set(name, value);
    startTransition(async () => {
      let outcome: FormState;
      try {
        outcome = await action({}, formData);
      } catch {
        outcome = { message: "The server could not be reached, so nothing changed. Try again." };
      }
      setResult(outcome);
      after?.(outcome);
    });
  };

  const closeDialog = () => {
    setRemoving(null);
    opener.current?.focus();
  };

  return (
    <>
      <h2 id="members-heading" ref={heading} tabIndex={-1} className="mb-2 font-semibold">
        Members ({members.length})
      </h2>
      <div id="member-message" data-testid="member-message">
        <FormMessage message={result.message} tone={result.ok ? "ok" : "error"} />
      </div>
      <TableScroll label="Members">
        <table className="w-full text-sm" aria-labelledby="members-heading">
          <thead className="muted text-left text-xs">
            <tr>
              <th className="py-1 pr-3 font-medium">Name and e-mail</th>
              <th className="py-1 pr-3 font-medium">Role</th>
              <th className="py-1 pr-3 font-medium">Joined</th>
              <th className="py-1 font-medium">
                <span className="sr-only">Remove</span>
              </th>
            </tr>
          </thead>
          <tbody className="divide-line">
            {members.map((member) => (
              <MemberRow
                // A new role from the server starts the row afresh (the select shows it).
                key={`${member.userId}:${member.role}`}
                member={member}
                isYou={member.userId === currentUserId}
                refused={refusedUserId === member.userId}
                pending={pending}
                onSave={(role) =>
                  run(changeRoleAction, { teamId, userId: member.userId, role }, (outcome) => {
                    setRefusedUserId(outcome.ok ? null : member.userId);
                    // A saved row is drawn afresh and loses the focus; a refused one keeps it.
                    if (outcome.ok) heading.current?.focus();
                  })
                }
                onRemove={(button) => {
                  opener.current = button;
                  setResult({});
                  setRefusedUserId(null);
                  setRemoving(member);
                }}
              />
            ))}
          </tbody>
        </table>
      </TableScroll>
      {members.length === 1 ? (
        <p className="muted mt-3 text-sm">
          You are the only member so far. Invite people with the form beside the list.
        </p>
      ) : null}
      <ConfirmDialog
        open={removing !== null}
        title={removing ? `Remove ${removing.name} from ${teamName}?` : ""}
        confirmLabel={removing ? `Remove ${removing.name}` : "Remove"}
        pending={pending}
        onCancel={closeDialog}
        onConfirm={() => {
          if (!removing) return;
          run(removeAction, { teamId, userId: removing.userId }, (outcome) => {
            setRemoving(null);
            // The row is gone; the heading above the message is the next sensible place.
            if (outcome.ok) heading.current?.focus();
            else opener.current?.focus();
          });
        }}
      >
        {removing ? (
          <>
            <p>
              {removing.userId === currentUserId ? "You" : removing.name} will lose access to the
              team&apos;s notebooks, instruments, line table and audit trail at once: every session
              and access token {removing.userId === currentUserId ? "you hold" : "they hold"} stops
              opening this team&apos;s records on its next request.
            </p>
            <p>
              What {removing.userId === currentUserId ? "you" : "they"} recorded stays in the
              team&apos;s records. {removing.userId === currentUserId ? "You" : "They"} will be told
              by e-mail; to undo it, invite{" "}
              {removing.userId === currentUserId ? "yourself" : "them"} again.
            </p>
          </>
        ) : null}
      </ConfirmDialog>
    </>
  );
}

function MemberRow({
  member,
  isYou,
  refused,
  pending,
  onSave,
  onRemove,
}: {
  member: TeamMember;
  isYou: boolean;
  /** Its last role change was refused: the select is marked and described by the message. */
  refused: boolean;
  pending: boolean;
  onSave: (role: TeamRole) => void;
  onRemove: (button: HTMLButtonElement) => void;
}) {
  const [role, setRole] = useState<TeamRole>(member.role);
  const selectId = `role-${member.userId}`;
  const changed = role !== member.role;
  return (
    <tr data-testid="member-row" data-email={member.email}>
      <td className="py-1.5 pr-3">
        <div className="font-medium">
          {member.name}
          {isYou ? <span className="muted font-normal"> (you)</span> : null}
        </div>
        <div className="muted text-xs wrap-anywhere">{member.email}</div>
      </td>
      <td className="py-1.5 pr-3">
        <form
          className="flex items-center gap-2"
          onSubmit={(event) => {
            event.preventDefault();
            if (changed) onSave(role);
          }}
        >
          <label htmlFor={selectId} className="sr-only">
            Role of {member.name}
          </label>
          <select
            id={selectId}
            value={role}
            onChange={(event) => setRole(event.target.value as TeamRole)}
            aria-invalid={refused || undefined}
            aria-describedby={refused ? "member-message" : undefined}
            className="rounded border border-[var(--line)] bg-[var(--panel)] px-2 py-1 aria-[invalid=true]:border-red-600"
          >
            {TEAM_ROLES.map((r) => (
              <option key={r} value={r}>
                {ROLE_LABELS[r]}
              </option>
            ))}
          </select>
          <Button
            type="submit"
            variant="quiet"
            disabled={!changed || pending}
            aria-label={`Save the role of ${member.name}`}
            className="disabled:opacity-50"
          >
            Save
          </Button>
        </form>
      </td>
      <td className="tabular py-1.5 pr-3 whitespace-nowrap">{member.joinedAt.slice(0, 10)}</td>
      <td className="py-1.5 text-right whitespace-nowrap">
        <Button
          type="button"
          variant="danger"
          disabled={pending}
          aria-label={`Remove ${member.name} from the team`}
          onClick={(event) => onRemove(event.currentTarget)}
        >
          Remove…
        </Button>
      </td>
    </tr>
  );
}
