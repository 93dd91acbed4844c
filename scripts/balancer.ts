/*
 * A loopback round-robin balancer for running several Emberwright processes on one machine: the
 * multi-process tests start it in-process, and `npx tsx scripts/balancer.ts --port 3000
 * http://127.0.0.1:3001 http://127.0.0.1:3002` tries the setup by hand. It is a test and
 * development tool; in production put nginx, HAProxy or the hosting platform's balancer in front.
 *
 * Like those, it
 * - adds X-Forwarded-For / -Proto / -Host (set TRUST_PROXY on the app processes behind it),
 * - checks each process's /api/health every half second and sends nothing to one that fails,
 * - passes a request that could not even connect (the process is gone) on to the next process,
 *   but never repeats one that reached a process (it may have been acted on: a POST is not
 *   idempotent), answering 502 instead.
 * Bodies are read whole before forwarding so that a refused connection can be retried; the limit
 * is MAX_BODY_BYTES.
 */
import { Agent, createServer, type IncomingMessage, type Server, type ServerResponse } from "node:http";
import { Readable } from "node:stream";
import { pathToFileURL } from "node:url";
import { createProxyServer } from "http-proxy-3";

const HEALTH_EVERY_MS = 500;
const MAX_BODY_BYTES = 80 * 1024 * 1024;
/** Response header naming the process that answered (its origin), for tests and debugging. */
export const BACKEND_HEADER = "x-emberwright-backend";

export type Balancer = {
  origin: string;
  /** Requests answered per target origin. */
  served: Map<string, number>;
  /** Targets currently receiving requests. */
  liveTargets: () => string[];
  close: () => Promise<void>;
};

const isNotConnected = (error: NodeJS.ErrnoException) =>
  error.code === "ECONNREFUSED" || error.code === "EHOSTUNREACH" || error.code === "ENOTFOUND";

/**
 * `keepAlive` reuses connections to the app processes, as nginx's upstream keepalive does: less CPU
 * per request on both sides. Off by default: a reused connection to a process that was just killed
 * fails with a reset rather than a refusal, and the balancer retries only refusals (the request may
 * have reached the process), so the crash tests run without it; the speed bench runs with it.
 */
export async function startBalancer(options: {
  targets: string[];
  port: number;
  host?: string;
  keepAlive?: boolean;
}): Promise<Balancer> {
  const host = options.host ?? "127.0.0.1";
  const targets = options.targets.map((t) => new URL(t).origin);
  const down = new Set<string>();
  const served = new Map(targets.map((t) => [t, 0]));
  let next = 0;
  const agent = options.keepAlive ? new Agent({ keepAlive: true, maxSockets: 256 }) : undefined;
  const proxy = createProxyServer({ xfwd: true, proxyTimeout: 60_000, ...(agent ? { agent } : {}) });
  proxy.on("proxyRes", (proxyRes, req) => {
    const target = (req as IncomingMessage & { emberwrightTarget?: string }).emberwrightTarget;
    if (!target) return;
    proxyRes.headers[BACKEND_HEADER] = target;
    served.set(target, (served.get(target) ?? 0) + 1);
  });

  const pick = (tried: Set<string>): string | null => {
    for (let i = 0; i < targets.length; i++) {
      const target = targets[(next + i) % targets.length]!;
      if (!down.has(target) && !tried.has(target)) {
        next = (next + i + 1) % targets.length;
        return target;
      }
    }
    // Every target looks down: try one not yet tried anyway (the health check may lag behind).
    return targets.find((t) => !tried.has(t)) ?? null;
  };

  const forward = (req: IncomingMessage, res: ServerResponse, body: Buffer, tried: Set<string>) => {
    const target = pick(tried);
    if (!target) {
      if (!res.headersSent) res.writeHead(502, { "Content-Type": "text/plain" });
      res.end("No app process is answering.");
      return;
    }
    tried.add(target);
    (req as IncomingMessage & { emberwrightTarget?: string }).emberwrightTarget = target;
    proxy.web(req, res, { target, buffer: Readable.from(body.length ? [body] : []) }, (error) => {
      const err = error as NodeJS.ErrnoException;
      if (isNotConnected(err) && !res.headersSent) {
        down.add(target);
        forward(req, res, body, tried);
        return;
      }
      if (!res.headersSent) res.writeHead(502, { "Content-Type": "text/plain" });
      res.end("The app process did not answer.");
    });
  };

  const server: Server = createServer((req, res) => {
    const chunks: Buffer[] = [];
    let size = 0;
    req.on("data", (chunk: Buffer) => {
      size += chunk.length;
      if (size > MAX_BODY_BYTES) {
        res.writeHead(413, { "Content-Type": "text/plain", Connection: "close" });
        res.end("Request body too large for the balancer.");
        req.destroy();
        return;
      }
      chunks.push(chunk);
    });
    req.on("end", () => {
      if (!res.writableEnded) forward(req, res, Buffer.concat(chunks), new Set());
    });
  });

  const check = async () => {
    await Promise.all(
      targets.map(async (target) => {
        try {
          const res = await fetch(`${target}/api/health`, { signal: AbortSignal.timeout(2_000) });
          if (res.ok) down.delete(target);
          else down.add(target);
        } catch {
          down.add(target);
        }
      }),
    );
  };
  await check();
  const timer = setInterval(() => void check(), HEALTH_EVERY_MS);
  timer.unref();

  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(options.port, host, () => resolve());
  });
  const address = server.address();
  const port = typeof address === "object" && address ? address.port : options.port;
  return {
    origin: `http://${host}:${port}`,
    served,
    liveTargets: () => targets.filter((t) => !down.has(t)),
    close: async () => {
      clearInterval(timer);
      server.closeAllConnections();
      await new Promise<void>((resolve) => server.close(() => resolve()));
      proxy.close();
      agent?.destroy();
    },
  };
}

// Run by hand: npx tsx scripts/balancer.ts --port 3000 [--keep-alive] http://127.0.0.1:3001 http://127.0.0.1:3002
if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  const args = process.argv.slice(2);
  const portAt = args.indexOf("--port");
  const port = portAt >= 0 ? Number(args[portAt + 1]) : 3000;
  const targets = args.filter((a, i) => a.startsWith("http") && i !== portAt + 1);
  if (!Number.isInteger(port) || targets.length === 0) {
    console.error("Usage: npx tsx scripts/balancer.ts --port 3000 http://127.0.0.1:3001 http://127.0.0.1:3002 …");
    process.exit(2);
  }
  const balancer = await startBalancer({ targets, port, keepAlive: args.includes("--keep-alive") });
  console.log(`Balancer on ${balancer.origin} → ${targets.join(", ")}`);
}
