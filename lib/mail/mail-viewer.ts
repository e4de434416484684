// The outgoing-mail viewer's rules, kept pure: when it is on, and how secret links are masked
// before a message leaves the server. A reset or invitation link is the key to an account: only
// its recipient may ever see it, so the viewer (a development tool) shows it to no one else.

/** The words that replace a secret in the viewer. */
export const MASKED_SECRET = "[hidden: only the recipient sees this link]";

/**
 * On outside production; in production only when EMBERLINE_MAIL_VIEWER=1 (the demo of
 * `npm start` and the tests switch it on). EMBERLINE_MAIL_VIEWER=0 turns it off everywhere.
 */
export function mailViewerEnabled(settings: {
  NODE_ENV?: string;
  EMBERLINE_MAIL_VIEWER?: string;
}): boolean {
  if (settings.EMBERLINE_MAIL_VIEWER === "1") return true;
  if (settings.EMBERLINE_MAIL_VIEWER === "0") return false;
  return settings.NODE_ENV !== "production";
}

// The path of every link that carries a secret token, then the token itself.
const SECRET_LINK = /(\/(?:reset-password|invitations)\/)[^\s/?#]+/g;
// Personal access tokens, should one ever be written into a message.
const ACCESS_TOKEN = /\bemb_[A-Za-z0-9_-]+/g;
// Any other long random-looking run (a 32-byte base64url secret is 43 characters; a UUID is 36 with
// hyphens in fixed places and stays readable), so a secret in a future message kind is masked too.
const LONG_RANDOM_RUN = /(?<![A-Za-z0-9_-])[A-Za-z0-9_-]{40,}(?![A-Za-z0-9_-])/g;

/** A message's text with every secret link and token replaced by {@link MASKED_SECRET}. */
export function maskMailSecrets(text: string): string {
  return text
    .replace(SECRET_LINK, `$1${MASKED_SECRET}`)
    .replace(ACCESS_TOKEN, MASKED_SECRET)
    .replace(LONG_RANDOM_RUN, MASKED_SECRET);
}
