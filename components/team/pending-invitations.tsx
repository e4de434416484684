"use client";
// The lab lead's list of invitations not yet accepted: resend one with a fresh link, or revoke it
// after a confirmation; what happened is said in the list's live region.
import { useRef, useState, useTransition } from "react";
import { Button } from "@/components/ui/button";
import { ConfirmDialog } from "@/components/ui/confirm-dialog";
import { FormMessage } from "@/components/ui/form-message";
import { ROLE_LABELS } from "@/lib/auth/roles";
import type { PendingInvitation } from "@/lib/services/teams";
import type { FormState } from "@/lib/validation/form-state";
import { TableScroll } from "@/components/ui/table-scroll";

type Action = (state: FormState, formData: FormData) => Promise<FormState>;

export function PendingInvitations({
  invitations,
  resendAction,
  revokeAction,
}: {
  invitations: PendingInvitation[];
  resendAction: Action;
  revokeAction: Action;
}) {
  const [result, setResult] = useState<FormState>({});
  const [revoking, setRevoking] = useState<PendingInvitation | null>(null);
  const [pending, startTransition] = useTransition();
  const opener = useRef<HTMLElement | null>(null);
  const heading = useRef<HTMLHeadingElement>(null);

  const run = (action: Action, invitationId: string, after?: (outcome: FormState) => void) => {
    const formData = new FormData();
    formData.set("invitationId", invitationId);
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

  return (
    <>
      <h2 id="invitations-heading" ref={heading} tabIndex={-1} className="mt-6 mb-2 font-semibold">
        Invitations not yet accepted ({invitations.length})
      </h2>
      <div id="invitation-message" data-testid="invitation-message">
        <FormMessage message={result.message} tone={result.ok ? "ok" : "error"} />
      </div>
      {invitations.length === 0 ? (
        <p className="muted text-sm">
          No invitation is waiting for an answer. People you invite appear here until they join.
        </p>
      ) : (
        <TableScroll label="Invitations waiting for an answer">
          <table className="w-full text-sm" aria-labelledby="invitations-heading">
            <thead className="muted text-left text-xs">
              <tr>
                <th className="py-1 pr-3 font-medium">E-mail</th>
                <th className="py-1 pr-3 font-medium">Role</th>
                <th className="py-1 pr-3 font-medium">Sent</th>
                <th className="py-1 pr-3 font-medium">Link valid until</th>
                <th className="py-1 font-medium">
                  <span className="sr-only">Resend or revoke</span>
                </th>
              </tr>
            </thead>
            <tbody className="divide-line">
              {invitations.map((invitation) => (
                <tr key={invitation.id} data-testid="invitation-row" data-email={invitation.email}>
                  <td className="py-1.5 pr-3 wrap-anywhere">{invitation.email}</td>
                  <td className="py-1.5 pr-3">{ROLE_LABELS[invitation.role]}</td>
                  <td className="tabular py-1.5 pr-3 whitespace-nowrap">
                    {invitation.sentAt.slice(0, 10)}
                    {invitation.invitedByName ? (
                      <span className="muted"> by {invitation.invitedByName}</span>
                    ) : null}
                  </td>
                  <td className="tabular py-1.5 pr-3 whitespace-nowrap">
                    {invitation.expired ? (
                      <span>
                        <span aria-hidden>⌛ </span>expired {invitation.expiresAt.slice(0, 10)}
                      </span>
                    ) : (
                      invitation.expiresAt.slice(0, 10)
                    )}
                  </td>
                  <td className="py-1.5 text-right whitespace-nowrap">
                    <div className="inline-flex gap-2">
                      <Button
                        type="button"
                        variant="quiet"
                        disabled={pending}
                        aria-label={`Resend the invitation to ${invitation.email}`}
                        onClick={() => run(resendAction, invitation.id)}
                      >
                        Resend
                      </Button>
                      <Button
                        type="button"
                        variant="danger"
                        disabled={pending}
                        aria-label={`Revoke the invitation to ${invitation.email}`}
                        onClick={(event) => {
                          opener.current = event.currentTarget;
                          setResult({});
                          setRevoking(invitation);
                        }}
                      >
                        Revoke…
                      </Button>
                    </div>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </TableScroll>
      )}
      <ConfirmDialog
        open={revoking !== null}
        title={revoking ? `Revoke the invitation to ${revoking.email}?` : ""}
        confirmLabel="Revoke the invitation"
        pending={pending}
        onCancel={() => {
          setRevoking(null);
          opener.current?.focus();
        }}
        onConfirm={() => {
          if (!revoking) return;
          run(revokeAction, revoking.id, (outcome) => {
            setRevoking(null);
            if (outcome.ok) heading.current?.focus();
            else opener.current?.focus();
          });
        }}
      >
        <p>
          The link in the invitation mail will refuse from now on, saying that the invitation was
          revoked, and {revoking?.email} will be told by e-mail. You can invite them again later.
        </p>
      </ConfirmDialog>
    </>
  );
}
