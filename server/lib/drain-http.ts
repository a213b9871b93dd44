import type { Server } from 'node:http';

/**
 * Stops taking connections and lets the requests in flight finish; connections still open after
 * `graceMs` are cut. Responses sent meanwhile say `Connection: close` (server/app.ts), so a
 * keep-alive client does not send its next request here.
 */
export function drainHttp(server: Server, graceMs: number): Promise<void> {
  return new Promise((resolve) => {
    const timer = setTimeout(() => server.closeAllConnections(), graceMs);
    timer.unref();
    server.close(() => {
      clearTimeout(timer);
      resolve();
    });
    server.closeIdleConnections();
  });
}
