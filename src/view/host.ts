// The viewer listens on the loopback interface only: 127.0.0.0/8 or ::1.
import { isIPv4, isIPv6 } from 'node:net';
import { UsageError } from '../errors/index.js';

/** Returns the address to bind for a --host value; throws UsageError for anything but a loopback address. */
export function loopbackHost(host: string): string {
  const h = host.trim().replace(/^\[(.*)\]$/, '$1').toLowerCase();
  if (h === 'localhost') return '127.0.0.1';
  if (isIPv4(h) && h.split('.')[0] === '127') return h;
  // The WHATWG URL parser writes every spelling of the IPv6 loopback (0:0:0:0:0:0:0:1, ::0001) as [::1].
  if (isIPv6(h) && new URL(`http://[${h}]/`).hostname === '[::1]') return '::1';
  throw new UsageError(`--host must be a loopback address (127.0.0.1, another 127.x.x.x, or ::1), got "${host}"; the viewer is never served to the network.`);
}

/** Returns the origin for a bound address and port, e.g. http://127.0.0.1:8080 or http://[::1]:8080. */
export function originOf(address: string, port: number): string {
  return `http://${address.includes(':') ? `[${address}]` : address}:${port}`;
}

/** Returns true when a request's Host header names this server through a loopback name (guards DNS rebinding). */
export function hostHeaderAllowed(header: string | undefined, port: number): boolean {
  if (!header) return false;
  const h = header.toLowerCase();
  return h === `127.0.0.1:${port}` || h === `localhost:${port}` || h === `[::1]:${port}` || new RegExp(`^127\\.\\d{1,3}\\.\\d{1,3}\\.\\d{1,3}:${port}$`).test(h);
}
