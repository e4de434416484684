// The sign-in page.
import Link from "next/link";
import { AuthForm } from "@/components/auth/auth-form";
import { safeNextPath } from "@/lib/http/safe-next-path";
import { signInAction } from "../actions";

export const metadata = { title: "Sign in" };

export default async function SignInPage({
  searchParams,
}: {
  searchParams: Promise<{ next?: string; reset?: string }>;
}) {
  const { next, reset } = await searchParams;
  return (
    <>
      <h1 className="mb-4 text-xl font-semibold">Sign in</h1>
      {reset ? (
        <p className="mb-3 text-sm text-teal-700">
          Your password is changed: every session was signed out and your access tokens were
          revoked. Sign in with the new one.
        </p>
      ) : null}
      <AuthForm
        action={signInAction}
        hidden={{ next: safeNextPath(next) }}
        submitLabel="Sign in"
        fields={[
          { name: "email", label: "E-mail", type: "email", autoComplete: "username" },
          {
            name: "password",
            label: "Password",
            type: "password",
            autoComplete: "current-password",
          },
        ]}
      />
      <p className="mt-4 text-sm">
        <Link href="/forgot-password" className="text-ember-600 underline">
          Forgot your password?
        </Link>
      </p>
    </>
  );
}
