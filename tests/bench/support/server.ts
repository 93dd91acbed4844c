/*
 * The production server as the end-to-end tests run it (scripts/e2e-server.sh): a fresh database
 * under data/bench with the demo seed, the local fakes, NODE_ENV=production and server.mjs
 * on 127.0.0.1 at a free port. Only the per-address form limit is raised, so the lead-request load
 * measures the server rather than the limiter.
 */
import type { ChildProcess } from "node:child_process";
import { mkdir, rm } from "node:fs/promises";
import path from "node:path";
import { freePort, runToEnd, startProcess, stopProcess } from "./processes";

export type BenchServer = {
  origin: string;
  pid: number;
  databaseFile: string;
  /** The environment the server process got (without what start-fakes.sh exported). */
  env: NodeJS.ProcessEnv;
  emailPort: number;
  paymentsPort: number;
  stop: () => Promise<void>;
  recentOutput: () => string;
};

const READY_TIMEOUT_MS = 30_000;
const SETUP_TIMEOUT_MS = 90_000;

export type BenchServerOptions = {
  /** Folder under data/ for the database and uploads (fresh each time); default "bench". */
  name?: string;
  /** Options for node before server.mjs (e.g. --expose-gc). */
  nodeArgs?: string[];
  /** Settings on top of the defaults below (e.g. TRUST_PROXY, APP_ORIGIN). */
  env?: Record<string, string>;
  /** Another process on the first one's database and fakes: no migration, no seed, no fakes of its own. */
  joins?: BenchServer;
};

/**
 * Migrates and seeds a fresh bench database, then starts the fakes and the server and waits for
 * /api/health; with `joins`, starts one more process on an existing server's database and fakes.
 */
export async function startBenchServer(root: string, options: BenchServerOptions = {}): Promise<BenchServer> {
  if (options.joins) return startJoiningServer(root, options.joins, options);
  const dataDir = path.join(root, "data", options.name ?? "bench");
  await rm(dataDir, { recursive: true, force: true });
  await mkdir(dataDir, { recursive: true });
  const [port, emailPort, paymentsPort] = [await freePort(), await freePort(), await freePort()];
  const databaseFile = path.join(dataDir, "emberwright.db");
  const env: NodeJS.ProcessEnv = {
    ...process.env,
    DATABASE_URL: `file:${databaseFile}`,
    UPLOADS_DIR: path.join(dataDir, "uploads"),
    PAYMENTS_FAKE_STATE: path.join(dataDir, "payments-fake.json"),
    SESSION_SECRET: "bench-secret-0123456789abcdef0123456789abcdef",
    PORT: String(port),
    HOST: "127.0.0.1",
    EMAIL_FAKE_PORT: String(emailPort),
    PAYMENTS_FAKE_PORT: String(paymentsPort),
    PUBLIC_FORM_LIMIT: "100000",
    APP_ORIGIN: `http://127.0.0.1:${port}`,
    STRIPE_WEBHOOK_SECRET: "whsec_bench_0123456789",
    STRIPE_SECRET_KEY: "sk_test_bench_0123456789",
    RESEND_API_KEY: "re_bench_0123456789",
    ACCESS_LOG: "off",
    ...options.env,
  };
  delete env.NODE_ENV;
  for (const script of ["scripts/migrate.ts", "scripts/seed.ts"]) {
    const result = await runToEnd(path.join(root, "node_modules/.bin/tsx"), [script], {
      cwd: root,
      env,
      timeoutMs: SETUP_TIMEOUT_MS,
    });
    if (result.code !== 0)
      throw new Error(
        `${script} failed (${result.timedOut ? "timed out" : `exit ${result.code}`}):\n${result.stderr || result.stdout}`,
      );
  }

  // The same steps as the e2e server script; `exec` makes the shell's pid the server's own pid,
  // so /proc/<pid> reads the server, while the fakes stay in the same process group.
  const shell = [
    "set -euo pipefail",
    "pids=()",
    "source scripts/start-fakes.sh",
    `exec node ${(options.nodeArgs ?? []).join(" ")} server.mjs`,
  ].join("\n");
  const child = startProcess("bash", ["-c", shell], { cwd: root, env: { ...env, NODE_ENV: "production" } });
  return watchUntilHealthy(child, `http://127.0.0.1:${port}`, { databaseFile, env, emailPort, paymentsPort });
}

async function startJoiningServer(root: string, first: BenchServer, options: BenchServerOptions): Promise<BenchServer> {
  const port = await freePort();
  const env: NodeJS.ProcessEnv = {
    ...first.env,
    PORT: String(port),
    APP_ORIGIN: first.env.APP_ORIGIN === first.origin ? `http://127.0.0.1:${port}` : first.env.APP_ORIGIN!,
    ...options.env,
    // What start-fakes.sh exports for the first process: the same fakes serve this one.
    RESEND_BASE_URL: `http://127.0.0.1:${first.emailPort}`,
    STRIPE_API_BASE: `http://127.0.0.1:${first.paymentsPort}`,
    NODE_ENV: "production",
  };
  const child = startProcess("node", [...(options.nodeArgs ?? []), "server.mjs"], { cwd: root, env });
  return watchUntilHealthy(child, `http://127.0.0.1:${port}`, {
    databaseFile: first.databaseFile,
    env,
    emailPort: first.emailPort,
    paymentsPort: first.paymentsPort,
  });
}

async function watchUntilHealthy(
  child: ChildProcess,
  origin: string,
  rest: Pick<BenchServer, "databaseFile" | "env" | "emailPort" | "paymentsPort">,
): Promise<BenchServer> {
  let output = "";
  const keep = (chunk: Buffer) => {
    output = (output + chunk.toString()).slice(-20_000);
  };
  child.stdout?.on("data", keep);
  child.stderr?.on("data", keep);

  try {
    await waitForHealth(origin, child);
  } catch (error) {
    await stopProcess(child);
    throw new Error(`${(error as Error).message}\nServer output:\n${output}`);
  }
  return {
    origin,
    pid: child.pid!,
    ...rest,
    stop: () => stopProcess(child),
    recentOutput: () => output,
  };
}

export async function waitForHealth(origin: string, child: ChildProcess): Promise<void> {
  const deadline = Date.now() + READY_TIMEOUT_MS;
  while (Date.now() < deadline) {
    if (child.exitCode !== null) throw new Error(`The server exited with code ${child.exitCode} before it was ready.`);
    try {
      const res = await fetch(`${origin}/api/health`);
      if (res.ok) return;
    } catch {
      // Not listening yet.
    }
    await new Promise((r) => setTimeout(r, 200));
  }
  throw new Error(`The server did not answer ${origin}/api/health within ${READY_TIMEOUT_MS / 1000} s.`);
}

/** Signs in through the login form like a browser would and returns the session cookie ("name=value"). */
export async function signIn(origin: string, email: string, password: string): Promise<string> {
  const res = await fetch(`${origin}/login`, {
    method: "POST",
    headers: { "Content-Type": "application/x-www-form-urlencoded", Origin: origin },
    body: new URLSearchParams({ email, password }).toString(),
    redirect: "manual",
  });
  const setCookie = res.headers.getSetCookie().find((c) => c.includes("="));
  if (!setCookie || res.status >= 400)
    throw new Error(`Sign-in as ${email} answered ${res.status} without a session cookie.`);
  return setCookie.split(";")[0]!;
}
