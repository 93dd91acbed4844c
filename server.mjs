// The production server (`npm start`, the demo, the end-to-end and bench runs). It does what
// react-router-serve did (compression, the built files, the app) and what that cannot:
// - the request's URL comes from APP_ORIGIN, never from the Host header a client sent;
// - the socket's peer address goes to the app (per-address limits; TRUST_PROXY decides whether a
//   proxy's X-Forwarded-For may speak for it);
// - every route kind has a body cap: a larger Content-Length gets 413 before any byte is read
//   (and no 100 Continue), a chunked body is cut off the moment it passes the cap;
// - built files and the favicon carry nosniff, and answers the app never shaped (the framework's
//   400 for a malformed Origin, a 500) still carry the security headers;
// - the access log never shows a query string or the secret of a link that is its own credential;
// - GET and HEAD /api/health are answered before the router, with the route's own JSON and headers.
import { createServer } from "node:http";
import path from "node:path";
import { Transform } from "node:stream";
import { pathToFileURL } from "node:url";
import { createReadableStreamFromReadable, writeReadableStreamToWritable } from "@react-router/node";
import compression from "compression";
import express from "express";
import { createRequestHandler } from "react-router";

process.env.NODE_ENV ??= "production";
const root = path.dirname(new URL(import.meta.url).pathname);
const buildPath = path.resolve(root, process.argv[2] ?? "build/server/index.js");

let build;
try {
  build = await import(pathToFileURL(buildPath).href);
} catch (error) {
  // A missing setting: print what to fix, not a stack trace.
  console.error(error instanceof Error && error.message.startsWith("Emberwright cannot start") ? error.message : error);
  process.exit(1);
}
const hooks = build.entry.module.serverHooks;
const handleRequest = createRequestHandler(build, process.env.NODE_ENV);

const MUTATIONS = new Set(["POST", "PUT", "PATCH", "DELETE"]);

function pathnameOf(rawUrl) {
  const q = rawUrl.indexOf("?");
  return q === -1 ? rawUrl : rawUrl.slice(0, q);
}

/** The log line's path: no query string, and the secret of a link that is its own credential replaced. */
const loggedPath = hooks.accessLogPath;

function sendPlain(res, status, headers, body) {
  const web = new Headers(headers);
  hooks.applyBaselineHeaders(web);
  res.writeHead(status, [...web.entries()].flat());
  res.end(body);
}

// After an early 413 the client may still be sending. Closing at once would make the kernel reset
// the connection and the client could lose the answer; so the rest is read and thrown away (never
// kept), for at most LINGER_BYTES or LINGER_MS, then the connection is cut. 16 MB lets a client on a
// busy machine finish a 10 MB body and read the 413 before the cut; the 5 s still bounds the cost.
const LINGER_BYTES = 16 * 1024 * 1024;
const LINGER_MS = 5_000;

function lingerThenClose(req) {
  if (req.complete) return;
  let discarded = 0;
  const cut = () => req.socket.destroy();
  const timer = setTimeout(cut, LINGER_MS);
  timer.unref();
  req.on("data", (chunk) => {
    discarded += chunk.length;
    if (discarded > LINGER_BYTES) {
      clearTimeout(timer);
      cut();
    }
  });
  req.on("end", () => clearTimeout(timer));
  req.resume();
}

async function send413(req, res, limit, { bodyInFlight = true } = {}) {
  const response = hooks.bodyTooLarge(limit);
  hooks.applyBaselineHeaders(response.headers);
  const body = await response.text();
  // Refused before "100 Continue": the client holds its body back, so the connection can just close.
  if (bodyInFlight) res.on("finish", () => lingerThenClose(req));
  else res.shouldKeepAlive = false;
  sendPlain(res, 413, response.headers, body);
}

/** The body as a web stream that stops at `limit` bytes; `onOverflow` answers 413. */
function cappedBody(req, limit, onOverflow) {
  let seen = 0;
  const counter = new Transform({
    transform(chunk, _encoding, callback) {
      seen += chunk.length;
      if (seen > limit.bytes) {
        req.unpipe(counter);
        onOverflow();
        callback(new Error("Request body over the limit."));
        return;
      }
      callback(null, chunk);
    },
  });
  req.pipe(counter);
  return createReadableStreamFromReadable(counter);
}

function toHeaders(req) {
  const headers = new Headers();
  for (let i = 0; i < req.rawHeaders.length; i += 2) {
    const name = req.rawHeaders[i];
    if (name.startsWith(":")) continue;
    try {
      headers.append(name, req.rawHeaders[i + 1]);
    } catch {
      // A header value undici refuses (rare control characters): leave it out.
    }
  }
  return headers;
}

async function handleApp(req, res) {
  const limit = hooks.bodyLimitFor(pathnameOf(req.url));
  const declared = req.headers["content-length"];
  if (MUTATIONS.has(req.method) && declared !== undefined && Number(declared) > limit.bytes) {
    await send413(req, res, limit);
    return;
  }
  let url;
  try {
    // Concatenated, not resolved: a request line like "//evil.example/x" stays a path.
    const origin = hooks.appOrigin ?? `http://${req.headers.host ?? "localhost"}`;
    url = new URL(`${origin}${req.url.startsWith("/") ? req.url : `/${req.url}`}`);
  } catch {
    sendPlain(res, 400, { "Content-Type": "text/plain; charset=utf-8" }, "Bad Request");
    return;
  }
  const controller = new AbortController();
  res.on("close", () => controller.abort());
  const init = { method: req.method, headers: toHeaders(req), signal: controller.signal };
  let overflowed = false;
  if (req.method !== "GET" && req.method !== "HEAD") {
    init.body = cappedBody(req, limit, () => {
      overflowed = true;
      // Aborted first, so the app sees a cancelled request rather than an error worth logging.
      controller.abort();
      if (!res.headersSent) void send413(req, res, limit);
    });
    init.duplex = "half";
  }
  let response;
  try {
    response = await handleRequest(new Request(url.href, init), hooks.createLoadContext(req.socket.remoteAddress));
  } catch (error) {
    if (!overflowed) console.error(error);
    if (!res.headersSent) sendPlain(res, 500, { "Content-Type": "text/plain; charset=utf-8" }, "Internal Server Error");
    return;
  }
  if (overflowed || res.headersSent) {
    await response.body?.cancel().catch(() => undefined);
    return;
  }
  await sendResponse(req, res, response);
}

const CLIENT_GONE = new Set(["ECONNRESET", "EPIPE", "ERR_STREAM_PREMATURE_CLOSE", "ERR_STREAM_DESTROYED"]);

/** Whether a write failed because the client closed the connection, not because the answer broke. */
function clientLeft(error) {
  return error?.constructor?.name === "WritableClosedError" || CLIENT_GONE.has(error?.code);
}

/** Writes a web Response to the Node response; answers the app never shaped get the baseline headers. */
async function sendResponse(req, res, response) {
  if (!response.headers.has("X-Content-Type-Options")) hooks.applyBaselineHeaders(response.headers);
  const raw = [];
  for (const [name, value] of response.headers) {
    if (name === "set-cookie") continue;
    raw.push(name, value);
  }
  for (const cookie of response.headers.getSetCookie()) raw.push("Set-Cookie", cookie);
  res.statusMessage = response.statusText || "";
  res.writeHead(response.status, raw);
  if (!response.body || req.method === "HEAD") {
    res.end();
    return;
  }
  try {
    await writeReadableStreamToWritable(response.body, res);
  } catch (error) {
    // The client went away mid-answer (a closed tab, a click elsewhere): nobody to tell, nothing to
    // log. Any other failure (the answer's own source breaking) is logged by the caller.
    if (clientLeft(error)) {
      await response.body.cancel().catch(() => undefined);
      return;
    }
    throw error;
  }
}

function staticHeaders(res) {
  res.setHeader("X-Content-Type-Options", "nosniff");
}

const app = express();
app.disable("x-powered-by");
app.use(compression());
app.use((req, res, next) => {
  const started = performance.now();
  res.on("finish", () => {
    if (process.env.ACCESS_LOG === "off") return;
    console.log(
      `${req.method} ${loggedPath(req.originalUrl)} ${res.statusCode} ${(performance.now() - started).toFixed(1)} ms`,
    );
  });
  next();
});
// GET and HEAD /api/health are answered here, without the router: the same JSON and the same
// headers as the route (the app builds both: `hooks.health`), without the route matching, the
// middleware chain and the request object a load balancer's frequent checks would otherwise pay
// for. Any other spelling or method goes on to the app as before.
if (hooks.health && hooks.healthPath) {
  app.use((req, res, next) => {
    if ((req.method !== "GET" && req.method !== "HEAD") || pathnameOf(req.url) !== hooks.healthPath) return next();
    hooks
      .health(req.headers.cookie)
      .then((response) => sendResponse(req, res, response))
      .catch((error) => {
        console.error(error);
        if (!res.headersSent)
          sendPlain(res, 500, { "Content-Type": "text/plain; charset=utf-8" }, "Internal Server Error");
        else res.destroy();
      });
  });
}
const clientDir = path.resolve(path.dirname(buildPath), "..", "client");
app.use(
  "/assets",
  express.static(path.join(clientDir, "assets"), { immutable: true, maxAge: "1y", setHeaders: staticHeaders }),
);
app.use(express.static(clientDir, { maxAge: "1h", setHeaders: staticHeaders }));
app.all("*", (req, res) => {
  handleApp(req, res).catch((error) => {
    console.error(error);
    if (!res.headersSent) sendPlain(res, 500, { "Content-Type": "text/plain; charset=utf-8" }, "Internal Server Error");
    else res.destroy();
  });
});

const server = createServer(app);
// A client that asks first (Expect: 100-continue, as curl does for large bodies) is refused before
// it sends a byte of an oversized body.
server.on("checkContinue", (req, res) => {
  const limit = hooks.bodyLimitFor(pathnameOf(req.url));
  const declared = req.headers["content-length"];
  if (declared !== undefined && Number(declared) > limit.bytes) {
    if (process.env.ACCESS_LOG !== "off")
      console.log(`${req.method} ${loggedPath(req.url)} 413 (refused before 100 Continue)`);
    void send413(req, res, limit, { bodyInFlight: false });
    return;
  }
  res.writeContinue();
  server.emit("request", req, res);
});

const port = Number(process.env.PORT ?? 3000);
const host = process.env.HOST;
server.listen(port, host, () => {
  console.log(
    `Emberwright listening on http://${host ?? "localhost"}:${port} (links use ${hooks.appOrigin ?? "the request's origin"})`,
  );
});
for (const signal of ["SIGINT", "SIGTERM"])
  process.on(signal, () => server.close(() => process.exit(0)) && setTimeout(() => process.exit(0), 2000).unref());
