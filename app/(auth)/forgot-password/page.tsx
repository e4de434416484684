// Ask for a password-reset link by e-mail.
import Link from "next/link";
import { AuthForm } from "@/components/auth/auth-form";
import { requestResetAction } from "../actions";

export const metadata = { title: "Reset password" };

export default function ForgotPasswordPage() {
  return (
    <>
      <h1 className="mb-2 text-xl font-semibold">Reset your password</h1>
      <p className="muted mb-4 text-sm">We e-mail you a link that works for one hour.</p>
      <AuthForm
        action={requestResetAction}
        submitLabel="Send the link"
        fields={[{ name: "email", label: "E-mail", type: "email", autoComplete: "username" }]}
      />
      <p className="mt-4 text-sm">
        <Link href="/sign-in" className="text-ember-600 underline">
          Back to sign-in
        </Link>
      </p>
    </>
  );
}
