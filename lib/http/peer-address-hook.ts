// Stamps every incoming HTTP request with its socket's remote address before Next.js sees it.
// Next 16 gives route handlers and server actions no peer address (NextRequest.ip is gone, and
// `next start` fills X-Forwarded-For from the socket only when a client did not send one), so the
// address comes from Node's public diagnostics channel, which fires before the request is handled.
import diagnosticsChannel from "node:diagnostics_channel";
import type { IncomingMessage } from "node:http";
import type { Socket } from "node:net";
import { PEER_ADDRESS_HEADER } from "./client-address";

let installed = false;

export function installPeerAddressHook(): void {
  if (installed) return;
  installed = true;
  diagnosticsChannel.subscribe("http.server.request.start", (message) => {
    const { request, socket } = message as { request: IncomingMessage; socket: Socket };
    // Always overwritten: a client-sent header of this name never survives.
    request.headers[PEER_ADDRESS_HEADER] = socket.remoteAddress ?? "";
  });
}
