/**
 * The HTTP plumbing both local fakes share: reading a capped body, JSON in and out, HTML pages,
 * bearer keys, matching a request to its endpoint, and starting and stopping the server.
 */
import type { IncomingMessage, Server, ServerResponse } from "node:http";
import type { AddressInfo } from "node:net";

export class BodyTooLargeError extends Error {}

/** The body as text; past `maxBytes` it rejects with BodyTooLargeError and drains the rest. */
export function readBody(req: IncomingMessage, maxBytes: number): Promise<string> {
  return new Promise((resolveBody, reject) => {
    const chunks: Buffer[] = [];
    let size = 0;
    const onData = (chunk: Buffer) => {
      size += chunk.length;
      if (size > maxBytes) {
        // Keep reading and dropping the rest, so the client gets the error answer rather than a reset socket.
        req.off("data", onData);
        req.resume();
        reject(new BodyTooLargeError());
        return;
      }
      chunks.push(chunk);
    };
    req.on("data", onData);
    req.on("end", () => resolveBody(Buffer.concat(chunks).toString("utf8")));
    req.on("error", reject);
  });
}

export class InvalidJsonError extends Error {}

/** Parsed JSON, or undefined for an empty (or blank) body; InvalidJsonError when it does not parse. */
export function parseJsonBody(text: string): unknown {
  if (text.trim() === "") return undefined;
  try {
    return JSON.parse(text);
  } catch {
    throw new InvalidJsonError();
  }
}

export function isJsonObject(value: unknown): value is Record<string, unknown> {
  return typeof value === "object" && value !== null && !Array.isArray(value);
}

/** JSON with object keys sorted, so two bodies that differ only in key order read the same. */
export function canonicalJson(value: unknown): string {
  if (Array.isArray(value)) return `[${value.map(canonicalJson).join(",")}]`;
  if (isJsonObject(value)) {
    const entries = Object.entries(value)
      .filter(([, item]) => item !== undefined)
      .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
    return `{${entries.map(([key, item]) => `${JSON.stringify(key)}:${canonicalJson(item)}`).join(",")}}`;
  }
  return JSON.stringify(value) ?? "null";
}

const JSON_HEADERS = { "Content-Type": "application/json; charset=utf-8", "Cache-Control": "no-store" };

/** Answers already-serialised JSON. */
export function sendJsonText(
  res: ServerResponse,
  status: number,
  text: string,
  headers: Record<string, string> = {},
): void {
  res.writeHead(status, { ...JSON_HEADERS, "Content-Length": Buffer.byteLength(text), ...headers });
  res.end(text);
}

/** Answers `body` as JSON; `indent` pretty-prints it (the payments service answers indented). */
export function sendJson(
  res: ServerResponse,
  status: number,
  body: unknown,
  headers: Record<string, string> = {},
  indent?: number,
): void {
  sendJsonText(res, status, JSON.stringify(body, null, indent), headers);
}

/** Answers a page with the fake's own security headers. */
export function sendHtml(res: ServerResponse, status: number, html: string, headers: Record<string, string>): void {
  res.writeHead(status, { ...headers, "Content-Length": Buffer.byteLength(html) });
  res.end(html);
}

/** The key of an `Authorization: Bearer <key>` header, or null. */
export function bearerKey(req: IncomingMessage): string | null {
  const header = req.headers.authorization?.trim() ?? "";
  return /^Bearer\s+(\S+)$/i.exec(header)?.[1] ?? null;
}

/** One endpoint: a method and a path pattern whose groups are its parameters (still URL-encoded). */
export interface Endpoint {
  method: string;
  pattern: RegExp;
}

export type EndpointMatch<E extends Endpoint> =
  { kind: "found"; endpoint: E; params: string[] } | { kind: "wrong-method"; allowed: string[] } | { kind: "none" };

/** The endpoint for `method` and `path`; "wrong-method" when the path exists for other methods. */
export function matchEndpoint<E extends Endpoint>(
  endpoints: readonly E[],
  method: string,
  path: string,
): EndpointMatch<E> {
  const onPath = endpoints.filter((e) => e.pattern.test(path));
  const endpoint = onPath.find((e) => e.method === method);
  if (endpoint) return { kind: "found", endpoint, params: endpoint.pattern.exec(path)!.slice(1) };
  return onPath.length ? { kind: "wrong-method", allowed: onPath.map((e) => e.method) } : { kind: "none" };
}

/** Listens on `port` (0 picks a free one) and `host`; resolves with the address once listening. */
export function listen(server: Server, port: number, host: string): Promise<AddressInfo> {
  return new Promise((resolveListen, reject) => {
    server.once("error", reject);
    server.listen(port, host, () => {
      server.off("error", reject);
      resolveListen(server.address() as AddressInfo);
    });
  });
}

/** Stops the server, dropping kept-alive connections (the SDKs keep them open; close() would wait for them). */
export function closeServer(server: Server): Promise<void> {
  return new Promise((resolveClose, reject) => {
    server.close((error) => (error ? reject(error) : resolveClose()));
    server.closeAllConnections();
  });
}

/** A whole number from the environment within [min, max], or `fallback` when unset. */
export function envInt(name: string, fallback: number, min: number, max: number): number {
  const raw = process.env[name];
  if (raw === undefined || raw === "") return fallback;
  const n = Number(raw);
  if (!Number.isInteger(n) || n < min || n > max) {
    throw new Error(`${name} must be a whole number from ${min} to ${max}; got "${raw}".`);
  }
  return n;
}
