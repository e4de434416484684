// Runs once when the Next.js server starts: installs what must see every request first.
export async function register(): Promise<void> {
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  const { installPeerAddressHook } = await import("./lib/http/peer-address-hook");
  installPeerAddressHook();
}
