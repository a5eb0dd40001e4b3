import { createServer, type Server } from 'node:http';
import { readFile } from 'node:fs/promises';
import { extname, join, normalize, sep } from 'node:path';
import type { AddressInfo } from 'node:net';

const TYPES: Record<string, string> = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.json': 'application/json; charset=utf-8',
  '.svg': 'image/svg+xml',
  '.ttf': 'font/ttf',
  '.csv': 'text/csv; charset=utf-8',
};

/** A running plain static host: files of `root` under the path `mount` (e.g. "/team/meanward/"). */
export interface StaticHost {
  /** The page's address, ending in the mount path. */
  url: string;
  /** Every path asked for, in order. */
  requests: string[];
  /** Stop listening and drop open connections (the host is gone, as when the network is). */
  close(): Promise<void>;
}

/**
 * The simplest static host there is, for the browser suite: no rewrites, no headers beyond the
 * content type and `Cache-Control: no-cache`, files read from disk on every request (so a test
 * can change them between requests), 404 for anything outside `mount`. Stands in for "any
 * static host, any sub-path" (README, "Putting Meanward online for a team").
 */
export async function startStaticHost(root: string, mount: string): Promise<StaticHost> {
  const requests: string[] = [];
  const server: Server = createServer((req, res) => {
    const path = decodeURIComponent(new URL(req.url ?? '/', 'http://host').pathname);
    requests.push(path);
    const send = (status: number, body: Buffer | string, type = 'text/plain; charset=utf-8') => {
      res.writeHead(status, { 'Content-Type': type, 'Cache-Control': 'no-cache' });
      res.end(body);
    };
    if (!path.startsWith(mount)) return send(404, 'Not found');
    const rel = path.slice(mount.length) || 'index.html';
    const file = normalize(join(root, rel.endsWith('/') ? `${rel}index.html` : rel));
    if (!file.startsWith(root + sep)) return send(404, 'Not found');
    readFile(file).then(
      (body) => send(200, body, TYPES[extname(file)] ?? 'application/octet-stream'),
      () => send(404, 'Not found'),
    );
  });
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const { port } = server.address() as AddressInfo;
  return {
    url: `http://127.0.0.1:${port}${mount}`,
    requests,
    close: () =>
      new Promise<void>((resolve) => {
        server.closeAllConnections();
        server.close(() => resolve());
      }),
  };
}
