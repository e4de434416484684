// The session cookie's name, importable by the proxy without pulling in server-only code.
export const SESSION_COOKIE = "emberline_session";
