/**
 * Runs once when a Next.js server process starts: validate the environment there, so a bad
 * or missing variable stops the server with a clear message instead of failing a request later;
 * stamp every incoming request with its connection's peer address; and answer a check at once
 * with 503 "busy" while every checker is (lib/server/busy-early.ts).
 */
export async function register(): Promise<void> {
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  const { env } = await import("./lib/server/env");
  env();
  await hookRequests();
}

/**
 * Route handlers see headers, never the socket, and Next fills X-Forwarded-For from the socket
 * only when the client sent none — so a forged header would pass for the client's address. Every
 * HTTP request this process serves gets `x-jp-peer-address` set to the socket's remote address
 * (overwriting a client's header of that name); lib/server/auth.ts `clientIp` starts from it and
 * believes X-Forwarded-For only from TRUSTED_PROXIES. Then a check that could only be answered
 * "busy" is answered so here, before the framework's routing (lib/server/busy-early.ts).
 */
async function hookRequests(): Promise<void> {
  const http = await import("node:http");
  const { PEER_ADDRESS_HEADER } = await import("./lib/server/peer-address");
  const { answerBusyEarly } = await import("./lib/server/busy-early");
  const proto = http.Server.prototype as unknown as {
    emit: (event: string | symbol, ...args: unknown[]) => boolean;
    __jpPeerStamp?: true;
  };
  if (proto.__jpPeerStamp) return;
  const emit = proto.emit;
  proto.emit = function (this: unknown, event: string | symbol, ...args: unknown[]) {
    if (event === "request") {
      const req = args[0] as import("node:http").IncomingMessage;
      const peer = req.socket?.remoteAddress;
      if (peer) req.headers[PEER_ADDRESS_HEADER] = peer;
      else delete req.headers[PEER_ADDRESS_HEADER];
      if (answerBusyEarly(req, args[1] as import("node:http").ServerResponse)) return true;
    }
    return emit.call(this, event, ...args);
  };
  proto.__jpPeerStamp = true;
}
