import http from "node:http";

/**
 * The socket's address of every request, in a header of our own that a client cannot set: the
 * HTTP server's request event is wrapped so the header is overwritten before Next sees the
 * request. Installed once per process from instrumentation.ts; read by ./client-ip.ts.
 */
export const PEER_ADDRESS_HEADER = "x-headroom-peer-address";

type Flag = { __headroomPeerAddressHeader?: boolean };

export function peerAddressHeaderInstalled(): boolean {
  return (globalThis as Flag).__headroomPeerAddressHeader === true;
}

export function installPeerAddressHeader(): void {
  if (peerAddressHeaderInstalled()) return;
  const emit = http.Server.prototype.emit;
  http.Server.prototype.emit = function emitWithPeerAddress(this: http.Server, event: string | symbol, ...args: unknown[]) {
    if (event === "request") {
      const request = args[0] as http.IncomingMessage;
      request.headers[PEER_ADDRESS_HEADER] = request.socket?.remoteAddress ?? "";
    }
    return Reflect.apply(emit, this, [event, ...args]) as boolean;
  } as typeof emit;
  (globalThis as Flag).__headroomPeerAddressHeader = true;
}
