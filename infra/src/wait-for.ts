import { connect } from 'node:net';

/** Resolve once something accepts TCP connections on host:port, or fail after `timeoutMs`. */
export async function waitForPort(host: string, port: number, what: string, timeoutMs = 30_000): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    if (await canConnect(host, port)) return;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`${what} did not start listening on ${host}:${port} within ${timeoutMs / 1000} s`);
}

export function canConnect(host: string, port: number): Promise<boolean> {
  return new Promise((resolve) => {
    const socket = connect({ host, port });
    socket.once('connect', () => {
      socket.destroy();
      resolve(true);
    });
    socket.once('error', () => resolve(false));
  });
}

/** Poll an HTTP URL until it answers 2xx. */
export async function waitForHttp(url: string, what: string, timeoutMs = 30_000): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  let last = '';
  while (Date.now() < deadline) {
    try {
      const res = await fetch(url);
      if (res.ok) return;
      last = `HTTP ${res.status}`;
    } catch (e) {
      last = (e as Error).message;
    }
    await new Promise((r) => setTimeout(r, 150));
  }
  throw new Error(`${what} was not ready at ${url} within ${timeoutMs / 1000} s (${last})`);
}
