// The person's account: password and personal access tokens for scripts and instrument PCs.
import { PasswordForm } from "@/components/account/password-form";
import { TokenForm } from "@/components/account/token-form";
import { PageHeader } from "@/components/ui/page-header";
import { PASSWORD_MIN_LENGTH } from "@/lib/auth/password";
import { fetchAccessTokens } from "@/lib/services/access-tokens";
import { requireWorkspace } from "@/lib/services/workspace";
import { changePasswordAction, createTokenAction, revokeTokenAction } from "../actions";

export const metadata = { title: "Account" };

export default async function AccountPage() {
  const { actor } = await requireWorkspace();
  const tokens = await fetchAccessTokens(actor);
  return (
    <>
      <PageHeader title="Account" description={`${actor.name} · ${actor.email}`} />
      <div className="grid gap-5 lg:grid-cols-2">
        <section className="panel p-4" aria-labelledby="password-heading">
          <h2 id="password-heading" className="mb-3 font-semibold">
            Password
          </h2>
          <PasswordForm action={changePasswordAction} minLength={PASSWORD_MIN_LENGTH} />
        </section>
        <section className="panel p-4" aria-labelledby="tokens-heading">
          <h2 id="tokens-heading" className="mb-1 font-semibold">
            Access tokens
          </h2>
          <p className="muted mb-3 text-sm">
            Scripts send a token in the header <code>Authorization: Bearer &lt;token&gt;</code>; it
            acts as you, in your teams.
          </p>
          {tokens.length === 0 ? (
            <p className="muted mb-3 text-sm">No tokens yet.</p>
          ) : (
            <ul className="divide-line mb-4 text-sm">
              {tokens.map((t) => (
                <li key={t.id} className="flex items-center justify-between py-1.5">
                  <span>
                    {t.name} <code className="muted text-xs">{t.prefix}…</code>
                    <span className="muted block text-xs">
                      made {t.createdAt.slice(0, 10)}
                      {t.lastUsedAt ? `, last used ${t.lastUsedAt.slice(0, 10)}` : ", never used"}
                    </span>
                  </span>
                  <form action={revokeTokenAction}>
                    <input type="hidden" name="tokenId" value={t.id} />
                    <button type="submit" className="text-xs text-red-700 underline">
                      Revoke {t.name}
                    </button>
                  </form>
                </li>
              ))}
            </ul>
          )}
          <TokenForm action={createTokenAction} />
        </section>
      </div>
    </>
  );
}
