// Raw HTTP requests for the server tests: node:http sends the path exactly as written (fetch would
// normalise "..", so traversal attempts must go through here).
import { request } from 'node:http';

export interface RawResponse {
  status: number;
  headers: Record<string, string | string[] | undefined>;
  body: Buffer;
}

/** Returns the response to one request with the path, method and Host header exactly as given. */
export function rawRequest(port: number, path: string, options: { method?: string; host?: string; address?: string } = {}): Promise<RawResponse> {
  return new Promise((resolve, reject) => {
    const req = request(
      { host: options.address ?? '127.0.0.1', port, path, method: options.method ?? 'GET', headers: { Host: options.host ?? `127.0.0.1:${port}` }, agent: false },
      (res) => {
        const chunks: Buffer[] = [];
        res.on('data', (c: Buffer) => chunks.push(c));
        res.on('end', () => resolve({ status: res.statusCode ?? 0, headers: res.headers, body: Buffer.concat(chunks) }));
      },
    );
    req.on('error', reject);
    req.end();
  });
}
