import { request } from 'node:http';

export interface RawAnswer {
  status: number;
  text: string;
}

/**
 * One HTTP request with the path sent exactly as given: no URL parsing, so `..`, `%00` and
 * malformed escapes reach the hub as a client could send them (fetch would normalise them).
 * A hub that does not answer within `timeoutMs` gives status 0.
 */
export function rawRequest(
  baseUrl: string,
  options: {
    method: string;
    path: string;
    headers?: Record<string, string>;
    body?: string;
    timeoutMs?: number;
  },
): Promise<RawAnswer> {
  const { hostname, port } = new URL(baseUrl);
  return new Promise((resolve, reject) => {
    const req = request(
      {
        host: hostname,
        port,
        method: options.method,
        path: options.path,
        headers: {
          ...options.headers,
          ...(options.body !== undefined
            ? { 'Content-Length': String(Buffer.byteLength(options.body)) }
            : {}),
        },
        timeout: options.timeoutMs ?? 10_000,
      },
      (res) => {
        const chunks: Buffer[] = [];
        res.on('data', (chunk: Buffer) => chunks.push(chunk));
        res.on('end', () =>
          resolve({ status: res.statusCode ?? 0, text: Buffer.concat(chunks).toString('utf8') }),
        );
        res.on('error', reject);
      },
    );
    req.on('timeout', () => {
      req.destroy();
      resolve({ status: 0, text: `no answer within ${options.timeoutMs ?? 10_000} ms` });
    });
    req.on('error', reject);
    req.end(options.body);
  });
}
