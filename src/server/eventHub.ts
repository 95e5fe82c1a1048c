/**
 * Server-sent events to every open page: one text/event-stream per page, a named event per change
 * (`changed` when the store changed, `drop` for a drop's progress and outcome, `watch` for a file
 * the watched folder delivered). A comment line every 15 s keeps proxies and idle timers from
 * closing the stream.
 */
import type { FastifyReply, FastifyRequest } from 'fastify';

export interface EventHub {
  /** Send one event to every open page. */
  publish(event: string, data: unknown): void;
  /** Serve one page's stream until it goes away. */
  attach(req: FastifyRequest, reply: FastifyReply): void;
  clients(): number;
  close(): void;
}

const KEEP_ALIVE_MS = 15_000;

export function createEventHub(): EventHub {
  const streams = new Set<FastifyReply>();
  let closed = false;
  const timer = setInterval(() => {
    for (const r of streams) r.raw.write(': still here\n\n');
  }, KEEP_ALIVE_MS);
  timer.unref();
  return {
    publish(event, data) {
      const text = `event: ${event}\ndata: ${JSON.stringify(data)}\n\n`;
      for (const r of streams) r.raw.write(text);
    },
    attach(req, reply) {
      // Once the server is closing, a page that asks again (an event stream reconnects by itself,
      // over a connection kept alive) is told there is nothing more: 204 ends its retries (HTML
      // Living Standard, server-sent events), and no stream is left open for the server to wait on.
      if (closed) return void reply.code(204).send();
      reply.hijack();
      const headers: Record<string, string> = {
        'Content-Type': 'text/event-stream; charset=utf-8',
        'Cache-Control': 'no-store',
        Connection: 'keep-alive',
      };
      for (const [k, v] of Object.entries(reply.getHeaders())) if (typeof v === 'string') headers[k] = v;
      reply.raw.writeHead(200, headers);
      reply.raw.write('retry: 2000\n\n');
      streams.add(reply);
      req.raw.on('close', () => streams.delete(reply));
    },
    clients: () => streams.size,
    close() {
      closed = true;
      clearInterval(timer);
      for (const r of streams) r.raw.end();
      streams.clear();
    },
  };
}
