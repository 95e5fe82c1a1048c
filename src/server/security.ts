/**
 * The bench page's guard: which requests reach a route at all. The page is for the bench computer
 * itself, so it listens on the loopback interface unless `--host` is given.
 *
 * - Host header: only the names this server answers to (127.0.0.1, localhost, [::1] and the bound
 *   host, with the port), so a web page elsewhere cannot reach it through DNS rebinding.
 * - Token: on any other interface every request needs the access token (a cookie set by opening the
 *   printed address once, an `Authorization: Bearer` header, or `?token=` on the first page).
 * - State changes (POST): the token, or a same-origin request (Origin equal to this server).
 * - Every answer carries a Content-Security-Policy without inline script, and no-sniff/no-referrer.
 */
import { timingSafeEqual } from 'node:crypto';
import type { FastifyInstance, FastifyReply, FastifyRequest } from 'fastify';

export interface GuardOptions {
  /** The interface the server listens on, as given (e.g. 127.0.0.1 or 0.0.0.0). */
  readonly host: string;
  readonly token: string;
  /** The port actually bound (known after listen). */
  readonly port: () => number;
  /** Ask for the token on the loopback interface too (a computer several people log in to). */
  readonly requireToken?: boolean;
}

export const TOKEN_COOKIE = 'benchproof_token';

/** Pages: own scripts and styles only; the record views get styles inline and nothing else. */
export const PAGE_CSP = "default-src 'none'; script-src 'self'; style-src 'self'; img-src 'self' data:; connect-src 'self'; font-src 'self'; base-uri 'none'; form-action 'self'; frame-src 'self'; frame-ancestors 'none'";
export const VIEW_CSP = "default-src 'none'; style-src 'unsafe-inline'; img-src data:; base-uri 'none'; form-action 'none'; frame-ancestors 'self'";

export function isLoopback(host: string): boolean {
  return host === '127.0.0.1' || host === 'localhost' || host === '::1' || host === '[::1]' || /^127\.\d+\.\d+\.\d+$/.test(host);
}

export function installGuard(app: FastifyInstance, options: GuardOptions): void {
  const open = isLoopback(options.host) && !options.requireToken;
  app.addHook('onRequest', async (req, reply) => {
    reply.header('X-Content-Type-Options', 'nosniff');
    reply.header('Referrer-Policy', 'no-referrer');
    reply.header('Content-Security-Policy', PAGE_CSP);
    reply.header('Cache-Control', 'no-store');
    if (!hostAllowed(req.headers.host, options)) return refuse(reply, 421, 'this server answers only to its own address (Host header refused)');
    const token = givenToken(req);
    const tokenOk = token !== undefined && sameSecret(token, options.token);
    if (!open && !tokenOk) return refuse(reply, 401, 'an access token is needed on this interface: open the address benchproof serve printed');
    if (!open && tokenOk && tokenFromQuery(req) !== undefined && req.method === 'GET') {
      // The printed address carries the token once; a cookie keeps it, and the address is cleaned.
      reply.header('Set-Cookie', `${TOKEN_COOKIE}=${options.token}; HttpOnly; SameSite=Strict; Path=/`);
      const url = new URL(req.url, 'http://x');
      url.searchParams.delete('token');
      return reply.redirect(`${url.pathname}${url.search}`, 303);
    }
    if (req.method !== 'GET' && req.method !== 'HEAD' && !tokenOk && !sameOrigin(req)) {
      return refuse(reply, 403, 'a change needs a request from this page (same origin) or the access token');
    }
    return undefined;
  });
}

function refuse(reply: FastifyReply, status: number, problem: string): FastifyReply {
  return reply.code(status).type('application/json').send({ error: { code: 'serve.refused', problem } });
}

function allowedHosts(options: GuardOptions): Set<string> {
  const port = options.port();
  const names = ['127.0.0.1', 'localhost', '[::1]'];
  const bound = options.host.includes(':') && !options.host.startsWith('[') ? `[${options.host}]` : options.host;
  if (!names.includes(bound) && bound !== '0.0.0.0' && bound !== '[::]') names.push(bound);
  return new Set(names.map((n) => `${n.toLowerCase()}:${port}`));
}

function hostAllowed(host: string | undefined, options: GuardOptions): boolean {
  if (!host) return false;
  const h = host.toLowerCase();
  if (allowedHosts(options).has(h)) return true;
  // Bound to every interface: any literal IP address of this machine is acceptable, never a name.
  const wildcard = options.host === '0.0.0.0' || options.host === '::';
  return wildcard && new RegExp(`^(\\d+\\.\\d+\\.\\d+\\.\\d+|\\[[0-9a-f:]+\\]):${options.port()}$`).test(h);
}

function tokenFromQuery(req: FastifyRequest): string | undefined {
  const q = req.query as Record<string, unknown> | undefined;
  return typeof q?.token === 'string' ? q.token : undefined;
}

function givenToken(req: FastifyRequest): string | undefined {
  const auth = req.headers.authorization;
  if (auth?.startsWith('Bearer ')) return auth.slice(7).trim();
  const cookie = req.headers.cookie?.split(';').map((p) => p.trim()).find((p) => p.startsWith(`${TOKEN_COOKIE}=`));
  if (cookie) return cookie.slice(TOKEN_COOKIE.length + 1);
  return tokenFromQuery(req);
}

function sameSecret(a: string, b: string): boolean {
  const x = Buffer.from(a);
  const y = Buffer.from(b);
  return x.length === y.length && timingSafeEqual(x, y);
}

/** A browser names the page a request came from; it must be this server itself. */
function sameOrigin(req: FastifyRequest): boolean {
  const origin = req.headers.origin;
  if (origin === undefined || origin === 'null') return false;
  return origin.toLowerCase() === `http://${(req.headers.host ?? '').toLowerCase()}`;
}
