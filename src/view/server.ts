// The viewer's HTTP server (node:http): the built viewer's files and a small JSON API, on loopback only.
//
// Routes (GET and HEAD only):
//   /                 the viewer (index.html), and the built assets beside it
//   /api/take         ViewTake: joints, sides, rates, layout of the positions, features, caution
//   /api/positions    display positions, float32 little-endian bytes (application/octet-stream)
//   /api/events       gait events and walking passes
//   /api/gait         the gait result (the JSON of `jointloom gait`) or why there is none
//   /api/pairs        the pair-line layer's measure (pair distance spread)
//   /api/forecast     ?t=SECONDS&samples=N: the model's forecast from t (only when a model was given;
//                     a bad t or N is 400 with a JSON error)
//   /api/factors      the coupling model's pair factor heat and ranked asymmetry (only with a model)
// Anything else is 404; a Host header that is not a loopback name is 403.
import { createServer, type IncomingMessage, type Server, type ServerResponse } from 'node:http';
import { existsSync, readFileSync, realpathSync } from 'node:fs';
import { extname, join } from 'node:path';
import { InputError } from '../errors/index.js';
import type { ViewData } from './data.js';
import type { ForecastService } from './forecast.js';
import { hostHeaderAllowed, loopbackHost, originOf } from './host.js';
import { CONTENT_TYPES, resolveStatic } from './static.js';

export interface ViewServerOptions {
  /** Folder of the built viewer (holds index.html). */
  staticRoot: string;
  data: ViewData;
  /** Loopback address to bind (default 127.0.0.1). */
  host?: string;
  /** Port; 0 (the default) takes a free one. */
  port?: number;
  /** The forecasts of a loaded model; without it /api/forecast is 404 and features.forecast false. */
  forecast?: ForecastService | null;
}

export interface ViewServer {
  /** The page's address, e.g. http://127.0.0.1:41234/ */
  url: string;
  port: number;
  server: Server;
  /** Stops listening and closes open connections. */
  close: () => Promise<void>;
}

/** The headers every answer carries: no sniffing, no framing, nothing fetched from another origin. */
const COMMON_HEADERS = {
  'X-Content-Type-Options': 'nosniff',
  'X-Frame-Options': 'DENY',
  'Referrer-Policy': 'no-referrer',
  'Content-Security-Policy': "default-src 'self'; img-src 'self' data:; style-src 'self'; script-src 'self'; connect-src 'self'; frame-ancestors 'none'",
};

interface Body {
  type: string;
  bytes: Buffer;
}

/** Returns the API bodies, serialised once. */
function apiBodies(data: ViewData, forecast: ForecastService | null): Map<string, Body> {
  const json = (v: unknown): Body => ({ type: 'application/json; charset=utf-8', bytes: Buffer.from(JSON.stringify(v)) });
  const take = forecast ? { ...data.take, features: { ...data.take.features, forecast: true, factors: true }, forecast: forecast.info } : data.take;
  return new Map([
    ['/api/take', json(take)],
    ['/api/positions', { type: 'application/octet-stream', bytes: data.positions }],
    ['/api/events', json(data.events)],
    ['/api/gait', json(data.gait)],
    ['/api/pairs', json(data.pairs)],
  ]);
}

function send(res: ServerResponse, req: IncomingMessage, status: number, type: string, bytes: Buffer, cache: string): void {
  res.writeHead(status, { ...COMMON_HEADERS, 'Content-Type': type, 'Content-Length': bytes.byteLength, 'Cache-Control': cache });
  res.end(req.method === 'HEAD' ? undefined : bytes);
}

function sendError(res: ServerResponse, req: IncomingMessage, status: number, message: string): void {
  send(res, req, status, 'application/json; charset=utf-8', Buffer.from(JSON.stringify({ error: message })), 'no-store');
}

/** Returns a running viewer server; throws InputError when the viewer is not built or the port is taken. */
export async function startViewServer(options: ViewServerOptions): Promise<ViewServer> {
  if (!existsSync(join(options.staticRoot, 'index.html')))
    throw new InputError(`the viewer is not built (no index.html in ${options.staticRoot}); run \`npm run build\` first.`);
  const root = realpathSync(options.staticRoot);
  const host = loopbackHost(options.host ?? '127.0.0.1');
  const forecast = options.forecast ?? null;
  const api = apiBodies(options.data, forecast);
  let port = options.port ?? 0;

  const server = createServer((req, res) => {
    const raw = req.url ?? '/';
    const path = raw.split('?', 1)[0]!.split('#', 1)[0]!;
    if (!hostHeaderAllowed(req.headers.host, port)) return sendError(res, req, 403, 'this server answers only to a loopback host name');
    if (req.method !== 'GET' && req.method !== 'HEAD') {
      res.setHeader('Allow', 'GET, HEAD');
      return sendError(res, req, 405, 'only GET and HEAD');
    }
    const body = api.get(path);
    if (body) return send(res, req, 200, body.type, body.bytes, 'no-store');
    if (path === '/api/forecast' && forecast) {
      const query = new URLSearchParams(raw.slice(path.length).split('#', 1)[0]!.replace(/^\?/, ''));
      let answer: ReturnType<ForecastService['answer']>;
      try {
        answer = forecast.answer(query);
      } catch (err) {
        return sendError(res, req, 500, `the forecast failed: ${err instanceof Error ? err.message : String(err)}`);
      }
      if (!Buffer.isBuffer(answer)) return sendError(res, req, answer.status, answer.error);
      return send(res, req, 200, 'application/json; charset=utf-8', answer, 'no-store');
    }
    if (path === '/api/factors' && forecast) {
      let bytes: Buffer;
      try {
        bytes = forecast.factors();
      } catch (err) {
        return sendError(res, req, 500, `the factors failed: ${err instanceof Error ? err.message : String(err)}`);
      }
      return send(res, req, 200, 'application/json; charset=utf-8', bytes, 'no-store');
    }
    if (path.startsWith('/api/')) return sendError(res, req, 404, 'no such API route');
    const file = resolveStatic(root, path);
    if (!file) return sendError(res, req, 404, 'not found');
    let bytes: Buffer;
    try {
      bytes = readFileSync(file);
    } catch {
      return sendError(res, req, 404, 'not found');
    }
    send(res, req, 200, CONTENT_TYPES[extname(file)]!, bytes, file.endsWith('.html') ? 'no-cache' : 'max-age=3600');
  });

  await new Promise<void>((resolve, reject) => {
    const onError = (err: NodeJS.ErrnoException) => {
      server.off('listening', onListening);
      if (err.code === 'EADDRINUSE') reject(new InputError(`port ${port} on ${host} is in use; pick another with --port, or 0 for a free one.`));
      else if (err.code === 'EACCES') reject(new InputError(`port ${port} on ${host} needs privileges; pick a port above 1023, or 0 for a free one.`));
      else if (err.code === 'EADDRNOTAVAIL') reject(new InputError(`${host} is not an address of this machine.`));
      else reject(err);
    };
    const onListening = () => {
      server.off('error', onError);
      resolve();
    };
    server.once('error', onError);
    server.once('listening', onListening);
    server.listen(port, host);
  });
  const addr = server.address();
  port = typeof addr === 'object' && addr ? addr.port : port;
  return {
    url: `${originOf(host, port)}/`,
    port,
    server,
    close: () =>
      new Promise<void>((resolve) => {
        server.close(() => resolve());
        server.closeAllConnections();
      }),
  };
}
