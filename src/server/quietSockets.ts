/**
 * The server's connections that are not carrying a request, so that closing the server ends them
 * instead of waiting on them. Node's own closeIdleConnections leaves a connection that has not sent
 * a request yet (browsers open spare ones ahead of need), and the server's close then waits until
 * the client gives it up or Node's header timeout ends it, up to a minute. A connection carrying a
 * request (a drop being checked and stored) is left to finish.
 */
import type { Server, IncomingMessage, ServerResponse } from 'node:http';
import type { Socket } from 'node:net';

export interface QuietSockets {
  /** Destroy every connection that carries no request now. */
  endQuiet(): void;
}

export function trackQuietSockets(server: Server): QuietSockets {
  const busy = new Map<Socket, number>();
  server.on('connection', (socket: Socket) => {
    busy.set(socket, 0);
    socket.on('close', () => busy.delete(socket));
  });
  server.on('request', (req: IncomingMessage, res: ServerResponse) => {
    const socket = req.socket;
    busy.set(socket, (busy.get(socket) ?? 0) + 1);
    res.on('close', () => {
      const requests = busy.get(socket);
      if (requests !== undefined) busy.set(socket, requests - 1);
    });
  });
  return {
    endQuiet() {
      for (const [socket, requests] of busy) if (requests === 0) socket.destroy();
    },
  };
}
