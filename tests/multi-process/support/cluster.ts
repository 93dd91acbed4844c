/*
 * Several production processes of the built app on one database, behind the loopback round-robin
 * balancer (scripts/balancer.ts), with the e-mail and payment stand-ins running in this process.
 *
 *   const cluster = await startCluster({ name: "three", processes: 3 });
 *   await fetch(`${cluster.origin}/api/health`);           // through the balancer
 *   await fetch(`${cluster.apps[1]!.origin}/api/plan`, …);  // straight to one process
 *   cluster.apps[0]!.kill9();                               // the process dies without warning
 *   await cluster.stop();
 *
 * Every process gets the same DATABASE_URL, UPLOADS_DIR (one shared folder), SESSION_SECRET and
 * APP_ORIGIN (the balancer), and TRUST_PROXY=loopback. The app is started exactly as `npm start`
 * says (its environment assignments and command are read from package.json), so a change of
 * server entry point is followed here. Ports: E2E_PORT + 10 for the balancer and + 11 … for the
 * processes, E2E_EMAIL_PORT and E2E_PAYMENTS_PORT for the stand-ins, when those are set; free
 * ports otherwise.
 */
import type { ChildProcess } from "node:child_process";
import { createServer, type Server } from "node:http";
import { existsSync, readFileSync } from "node:fs";
import { mkdir, rm } from "node:fs/promises";
import path from "node:path";
import { createClient, type Client } from "@libsql/client";
import { startEmailFake, type EmailFake } from "../../../fakes/email/server";
import { startPaymentsFake, type PaymentsFake } from "../../../fakes/payments/server";
import { createProxyServer } from "http-proxy-3";
import { startBalancer, type Balancer } from "../../../scripts/balancer";
import { freePort, killAllNow, runToEnd, startProcess, stopProcess } from "../../bench/support/processes";

// The app processes run in process groups of their own: if this test process dies, take them along.
process.once("exit", killAllNow);

export const ROOT = path.resolve(import.meta.dirname, "../../..");
const TSX = path.join(ROOT, "node_modules/.bin/tsx");
const READY_TIMEOUT_MS = 60_000;

// Production values of their own (a production server refuses the public local ones).
export const SECRETS = {
  SESSION_SECRET: "multi-process-secret-0123456789abcdef0123456789",
  STRIPE_WEBHOOK_SECRET: "whsec_multi_process_0123456789abcdef",
  STRIPE_SECRET_KEY: "sk_test_multi_process_0123456789",
  RESEND_API_KEY: "re_multi_process_0123456789",
};

export type AppProcess = {
  index: number;
  origin: string;
  child: ChildProcess;
  /** SIGKILL to the process itself: no shutdown handlers run, open transactions are cut. */
  kill9: () => void;
  stop: () => Promise<void>;
  isRunning: () => boolean;
  output: () => string;
};

export type Cluster = {
  name: string;
  dataDir: string;
  databaseFile: string;
  uploadsDir: string;
  /** The balancer's origin (also every process's APP_ORIGIN). */
  origin: string;
  balancer: Balancer;
  apps: AppProcess[];
  mail: EmailFake;
  /**
   * Every send the app processes made, counted by Idempotency-Key before the e-mail fake sees it
   * (the fake, like the service, answers a repeated key with the first message, so it cannot count
   * repeats itself).
   */
  mailSends: Map<string, number>;
  payments: PaymentsFake;
  /** The environment every app process got (for scripts run against the same data). */
  env: NodeJS.ProcessEnv;
  /** A database client of the test's own on the cluster's file. */
  db: Client;
  /** Runs a project script (tsx) with the cluster's environment (plus `env`); throws on a non-zero exit. */
  runScript: (script: string, args?: string[], env?: NodeJS.ProcessEnv) => Promise<string>;
  /** Starts process `index` again on its port (after kill9 or stop) and waits until it is healthy. */
  restart: (index: number) => Promise<AppProcess>;
  stop: () => Promise<void>;
};

type Options = {
  name: string;
  processes: number;
  /** Seed the demo data after the processes are up (default true). */
  seed?: boolean;
  /** Extra environment for the app processes (e.g. a sign-in limit). */
  env?: NodeJS.ProcessEnv;
};

/** The command `npm start` runs, split into its leading VAR=value assignments and the command. */
export function startCommand(): { env: Record<string, string>; command: string; args: string[] } {
  const pkg = JSON.parse(readFileSync(path.join(ROOT, "package.json"), "utf8")) as { scripts: Record<string, string> };
  const words = pkg.scripts.start!.trim().split(/\s+/);
  const env: Record<string, string> = {};
  while (words[0] && /^[A-Z_][A-Z0-9_]*=/.test(words[0])) {
    const [key, ...value] = words.shift()!.split("=");
    env[key!] = value.join("=");
  }
  const [command, ...args] = words;
  const local = path.join(ROOT, "node_modules/.bin", command!);
  return { env, command: existsSync(local) ? local : command!, args };
}

async function ports(count: number): Promise<{ balancer: number; apps: number[]; email: number; payments: number }> {
  const base = Number(process.env.E2E_PORT);
  if (Number.isInteger(base) && base > 0) {
    return {
      balancer: base + 10,
      apps: Array.from({ length: count }, (_, i) => base + 11 + i),
      email: Number(process.env.E2E_EMAIL_PORT) || (await freePort()),
      payments: Number(process.env.E2E_PAYMENTS_PORT) || (await freePort()),
    };
  }
  const apps: number[] = [];
  for (let i = 0; i < count; i++) apps.push(await freePort());
  return { balancer: await freePort(), apps, email: await freePort(), payments: await freePort() };
}

export async function waitForHealth(origin: string, child?: ChildProcess, timeoutMs = READY_TIMEOUT_MS): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    if (child && child.exitCode !== null)
      throw new Error(`${origin} exited with code ${child.exitCode} before it was ready.`);
    try {
      const res = await fetch(`${origin}/api/health`, { signal: AbortSignal.timeout(2_000) });
      if (res.ok) return;
    } catch {
      // Not listening yet.
    }
    await new Promise((r) => setTimeout(r, 150));
  }
  throw new Error(`${origin}/api/health did not answer within ${timeoutMs / 1000} s.`);
}

/** Starts the stand-ins, `processes` app processes at once on a fresh database, then the balancer. */
export async function startCluster(options: Options): Promise<Cluster> {
  if (!existsSync(path.join(ROOT, "build/server/index.js")))
    throw new Error("No production build: run `npm run build` first.");
  const dataDir = path.join(ROOT, "data", "multi-process", options.name);
  await rm(dataDir, { recursive: true, force: true });
  await mkdir(dataDir, { recursive: true });
  const databaseFile = path.join(dataDir, "emberwright.db");
  const uploadsDir = path.join(dataDir, "uploads");
  const port = await ports(options.processes);
  const origin = `http://127.0.0.1:${port.balancer}`;

  const mail = await startEmailFake({ port: port.email, host: "127.0.0.1", apiKey: SECRETS.RESEND_API_KEY });
  const mailCounter = await countMailSends(mail.url);
  const payments = await startPaymentsFake({
    port: port.payments,
    host: "127.0.0.1",
    webhookUrl: `${origin}/api/webhooks/stripe`,
    webhookSecret: SECRETS.STRIPE_WEBHOOK_SECRET,
    stateFile: path.join(dataDir, "payments-fake.json"),
    retryBaseMs: 200,
    log: () => undefined,
  });

  const start = startCommand();
  const env: NodeJS.ProcessEnv = {
    ...process.env,
    ...start.env,
    NODE_ENV: "production",
    HOST: "127.0.0.1",
    DATABASE_URL: `file:${databaseFile}`,
    UPLOADS_DIR: uploadsDir,
    APP_ORIGIN: origin,
    TRUST_PROXY: "loopback",
    RESEND_BASE_URL: mailCounter.url,
    STRIPE_API_BASE: payments.url,
    PUBLIC_FORM_LIMIT: "100000",
    OUTBOX_WORKER: "on",
    ACCESS_LOG: "off",
    ...SECRETS,
    ...options.env,
  };
  delete env.VITEST;
  delete env.VITEST_POOL_ID;
  delete env.VITEST_WORKER_ID;

  const launch = (index: number, appPort: number): AppProcess => {
    const child = startProcess(start.command, start.args, { cwd: ROOT, env: { ...env, PORT: String(appPort) } });
    let output = "";
    const keep = (chunk: Buffer) => {
      output = (output + chunk.toString()).slice(-20_000);
    };
    child.stdout?.on("data", keep);
    child.stderr?.on("data", keep);
    return {
      index,
      origin: `http://127.0.0.1:${appPort}`,
      child,
      kill9: () => {
        if (child.pid) process.kill(child.pid, "SIGKILL");
      },
      stop: () => stopProcess(child),
      isRunning: () => child.exitCode === null && child.signalCode === null,
      output: () => output,
    };
  };

  const apps = port.apps.map((p, i) => launch(i, p));
  let balancer: Balancer | null = null;
  const db = createClient({ url: `file:${databaseFile}`, timeout: 5_000 });
  const stop = async () => {
    await balancer?.close();
    await Promise.all(apps.map((a) => a.stop()));
    db.close();
    await mailCounter.close();
    await mail.close();
    await payments.close();
  };
  try {
    await Promise.all(apps.map((a) => waitForHealth(a.origin, a.child)));
  } catch (error) {
    await stop();
    throw new Error(
      `${(error as Error).message}\n${apps.map((a) => `--- process ${a.index}:\n${a.output()}`).join("\n")}`,
    );
  }

  const runScript = async (script: string, args: string[] = [], extra: NodeJS.ProcessEnv = {}) => {
    const scriptEnv = { ...env, ...extra };
    delete scriptEnv.NODE_ENV;
    const result = await runToEnd(TSX, [script, ...args], { cwd: ROOT, env: scriptEnv, timeoutMs: 120_000 });
    if (result.code !== 0)
      throw new Error(`${script} ${args.join(" ")} failed (exit ${result.code}):\n${result.stderr || result.stdout}`);
    return result.stdout;
  };
  if (options.seed ?? true) await runScript("scripts/seed.ts");
  balancer = await startBalancer({ targets: apps.map((a) => a.origin), port: port.balancer });

  const restart = async (index: number) => {
    const old = apps[index]!;
    await old.stop();
    const fresh = launch(index, port.apps[index]!);
    apps[index] = fresh;
    await waitForHealth(fresh.origin, fresh.child);
    return fresh;
  };

  return {
    name: options.name,
    dataDir,
    databaseFile,
    uploadsDir,
    origin,
    balancer,
    apps,
    mail,
    mailSends: mailCounter.sends,
    payments,
    env,
    db,
    runScript,
    restart,
    stop,
  };
}

/** A pass-through in front of the e-mail fake that counts each POST by its Idempotency-Key. */
async function countMailSends(
  target: string,
): Promise<{ url: string; sends: Map<string, number>; close: () => Promise<void> }> {
  const sends = new Map<string, number>();
  const proxy = createProxyServer({ target });
  const server: Server = createServer((req, res) => {
    const key = req.headers["idempotency-key"];
    if (req.method === "POST" && typeof key === "string") sends.set(key, (sends.get(key) ?? 0) + 1);
    proxy.web(req, res, {}, () => {
      if (!res.headersSent) res.writeHead(502);
      res.end();
    });
  });
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", () => resolve()));
  const address = server.address();
  const url = `http://127.0.0.1:${typeof address === "object" && address ? address.port : 0}`;
  return {
    url,
    sends,
    close: async () => {
      server.closeAllConnections();
      await new Promise<void>((resolve) => server.close(() => resolve()));
      proxy.close();
    },
  };
}
