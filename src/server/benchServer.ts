/**
 * The bench page's server: fastify with the guard (security.ts) in front of every route, the page's
 * own built assets (dist/web, made by `npm ci` through vite), the JSON routes over the records and
 * the check pipeline, and the live stream fed by the store's change marker.
 */
import { existsSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import Fastify from 'fastify';
import type { FastifyInstance } from 'fastify';
import fastifyStatic from '@fastify/static';
import fastifyMultipart from '@fastify/multipart';
import { BenchError } from '../types/index.js';
import type { CommandContext } from '../cli/context.js';
import type { StoreFlags } from '../cli/store.js';
import { installGuard, isLoopback } from './security.js';
import { createEventHub } from './eventHub.js';
import { DEFAULT_LIMITS, openBench } from './benchSetup.js';
import type { BenchSetup, UploadLimits } from './benchSetup.js';
import { watchStoreMarker } from './storeMarker.js';
import { trackQuietSockets } from './quietSockets.js';
import { registerBoardRoutes } from './boardRoutes.js';
import { registerDropRoutes } from './dropRoutes.js';
import { registerUnitRoutes } from './unitRoutes.js';
import { registerPlotRoutes } from './plotRoutes.js';
import { registerBatchRoutes } from './batchRoutes.js';
import { createCaptureCache } from './captureCache.js';
import { accessToken } from './accessToken.js';
import { errorBody } from './errorBody.js';

export interface BenchServerOptions {
  readonly host?: string;
  readonly port?: number;
  readonly flags: StoreFlags;
  readonly specFile?: string;
  readonly limits?: Partial<UploadLimits>;
  /** Where the built page is; dist/web beside this module's tree by default. */
  readonly assets?: string;
  /** How often the store's change marker is looked at, in ms. */
  readonly markerMs?: number;
  /** Ask for the access token on the loopback interface too. */
  readonly requireToken?: boolean;
}

export interface BenchServer {
  readonly app: FastifyInstance;
  readonly setup: BenchSetup;
  /** The address to open, e.g. http://127.0.0.1:8400/ (with the token when one is needed). */
  readonly url: string;
  readonly token: string;
  readonly needsToken: boolean;
  close(): Promise<void>;
}

export const DEFAULT_ASSETS = resolve(dirname(fileURLToPath(import.meta.url)), '../../dist/web');

export async function startBenchServer(ctx: CommandContext, options: BenchServerOptions): Promise<BenchServer> {
  const { host = '127.0.0.1', port = 0, assets = DEFAULT_ASSETS } = options;
  if (!existsSync(resolve(assets, 'index.html'))) throw noAssets(assets);
  const hub = createEventHub();
  const limits = { ...DEFAULT_LIMITS, ...options.limits };
  const setup = openBench(ctx, options.flags, hub, options.specFile, limits);
  const token = accessToken(setup.location.dir);
  const app = Fastify({ logger: false, bodyLimit: 1024 * 1024 });
  const quiet = trackQuietSockets(app.server);
  let bound = port;
  installGuard(app, { host, token, port: () => bound, requireToken: options.requireToken === true });
  await app.register(fastifyMultipart, { limits: { fileSize: limits.maxFileBytes, files: limits.maxFiles } });
  await app.register(fastifyStatic, { root: assets, prefix: '/', index: 'index.html', dotfiles: 'deny', cacheControl: false });
  // A BenchError from any route (e.g. records.tampered from the store) reaches the page as check prints it.
  app.setErrorHandler((err, _req, reply) => {
    const body = errorBody(err);
    if (body.status === 500) ctx.io.stderr(`benchproof serve: internal error: ${err instanceof Error ? (err.stack ?? err.message) : String(err)}\n`);
    return reply.code(body.status).send(body);
  });
  registerBoardRoutes(app, setup);
  registerDropRoutes(app, setup);
  registerUnitRoutes(app, setup);
  registerPlotRoutes(app, setup, createCaptureCache(setup.location.dir));
  registerBatchRoutes(app, setup);
  const marker = watchStoreMarker(
    setup.changeMarker,
    () => {
      try {
        setup.refresh();
      } catch (err) {
        // The records stay readable through the handle already open; the next change tries again.
        ctx.io.stderr(`benchproof serve: the records could not be opened again: ${err instanceof Error ? err.message : String(err)}\n`);
      }
      setup.follower.changed();
      hub.publish('changed', { at: new Date().toISOString() });
    },
    options.markerMs,
  );
  try {
    await app.listen({ host, port });
  } catch (err) {
    marker.stop();
    hub.close();
    setup.close();
    throw listenError(err, host, port);
  }
  // The start-up pass over every run begins now, so the board's first answer seldom waits for it;
  // a problem it finds is shown by the routes that read through it.
  setup.follower.catchUp().catch(() => undefined);
  const address = app.server.address();
  bound = typeof address === 'object' && address ? address.port : port;
  const needsToken = !isLoopback(host) || options.requireToken === true;
  const shownHost = host.includes(':') ? `[${host}]` : host === '0.0.0.0' ? '127.0.0.1' : host;
  const url = `http://${shownHost}:${bound}/${needsToken ? `?token=${token}` : ''}`;
  return {
    app,
    setup,
    url,
    token,
    needsToken,
    async close() {
      marker.stop();
      hub.close();
      const closing = app.close();
      // Connections with no request in them (idle, or opened ahead of need) would hold the close; one
      // whose request ends while closing becomes quiet too, so they are looked at until it is done.
      quiet.endQuiet();
      const sweep = setInterval(() => quiet.endQuiet(), 250);
      try {
        await closing;
      } finally {
        clearInterval(sweep);
      }
      setup.close();
    },
  };
}

function noAssets(dir: string): BenchError {
  return new BenchError({ code: 'serve.no-page', file: dir, problem: 'the bench page has not been built', expected: 'the page assets (index.html) that `npm ci` builds', fix: 'run npm run build in the benchproof folder' });
}

function listenError(err: unknown, host: string, port: number): BenchError {
  const code = (err as { code?: string }).code ?? 'listen error';
  return new BenchError({
    code: 'serve.cannot-listen',
    file: '-',
    problem: `cannot listen on ${host} port ${port} (${code})`,
    expected: code === 'EADDRINUSE' ? 'a port no other program uses' : 'an address of this computer',
    fix: code === 'EADDRINUSE' ? 'choose another --port, or leave it out for a free one' : 'leave out --host to listen on this computer only',
  });
}
