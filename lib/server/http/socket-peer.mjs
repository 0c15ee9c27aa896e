// Preloaded into the server process (`node --import ./lib/server/http/socket-peer.mjs …/next start`, as `npm start` and
// the stack runner do). Next's route handlers never see the TCP socket, and `next start` keeps a client's own
// X-Forwarded-For instead of adding the peer to it, so before Next reads a request this stamps the socket's
// remote address into `x-stochos-peer`, overwriting whatever a client sent under that name.
// lib/server/http/client-address.ts starts from it and trusts forwarded headers only from TRUSTED_PROXIES.
import http from 'node:http';
import https from 'node:https';

const HEADER = 'x-stochos-peer';

for (const Server of [http.Server, https.Server]) {
  const emit = Server.prototype.emit;
  Server.prototype.emit = function stampPeer(event, req) {
    if (event === 'request' && req && req.headers) req.headers[HEADER] = (req.socket && req.socket.remoteAddress) || '';
    return emit.apply(this, arguments);
  };
}

globalThis[Symbol.for('stochos.socketPeer')] = HEADER;
