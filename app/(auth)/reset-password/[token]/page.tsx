// Choose a new password from a reset link.
import { AuthForm } from "@/components/auth/auth-form";
import { PASSWORD_MIN_LENGTH } from "@/lib/auth/password";
import { resetPasswordAction } from "../../actions";

export const metadata = { title: "Choose a new password" };

export default async function ResetPasswordPage({
  params,
}: {
  params: Promise<{ token: string }>;
}) {
  const { token } = await params;
  return (
    <>
      <h1 className="mb-4 text-xl font-semibold">Choose a new password</h1>
      <AuthForm
        action={resetPasswordAction}
        hidden={{ token }}
        submitLabel="Save the new password"
        fields={[
          {
            name: "password",
            label: "New password",
            type: "password",
            autoComplete: "new-password",
            hint: `At least ${PASSWORD_MIN_LENGTH} characters.`,
          },
        ]}
      />
    </>
  );
}
