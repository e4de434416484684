// Join a team from an invitation link: set a password (new person) or confirm it (existing account).
import Link from "next/link";
import { AuthForm } from "@/components/auth/auth-form";
import { PASSWORD_MIN_LENGTH } from "@/lib/auth/password";
import { ROLE_LABELS } from "@/lib/auth/roles";
import { describeInvitation } from "@/lib/services/teams";
import { acceptInvitationAction } from "../../actions";

export const metadata = { title: "Join a team" };

export default async function InvitationPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const invitation = await describeInvitation(token);
  if (invitation.state !== "open") {
    return (
      <>
        <h1 className="mb-2 text-xl font-semibold">This invitation is not valid</h1>
        <p className="muted text-sm" data-testid="invitation-closed" data-state={invitation.state}>
          {invitation.message}
        </p>
        <Link href="/sign-in" className="mt-4 inline-block text-sm text-ember-600 underline">
          Go to sign-in
        </Link>
      </>
    );
  }
  return (
    <>
      <h1 className="mb-1 text-xl font-semibold">Join {invitation.teamName}</h1>
      <p className="muted mb-4 text-sm">
        As {ROLE_LABELS[invitation.role].toLowerCase()}, with the address {invitation.email}.
      </p>
      <AuthForm
        action={acceptInvitationAction}
        hidden={{ token }}
        submitLabel="Join the team"
        fields={
          invitation.hasAccount
            ? [
                {
                  name: "password",
                  label: "Your current password",
                  type: "password",
                  autoComplete: "current-password",
                },
              ]
            : [
                { name: "name", label: "Your name", autoComplete: "name" },
                {
                  name: "password",
                  label: "Choose a password",
                  type: "password",
                  autoComplete: "new-password",
                  hint: `At least ${PASSWORD_MIN_LENGTH} characters.`,
                },
              ]
        }
      />
    </>
  );
}
