/*
 * Child processes for the bench: each one is started in its own process group and remembered, so
 * one call (also from signal and crash handlers) ends the group: a shell, the tsx wrappers it
 * starts and their Node children all go together.
 */
import { type ChildProcess, spawn } from "node:child_process";
import { createServer } from "node:net";

const running = new Set<ChildProcess>();

type SpawnArgs = { cwd: string; env?: NodeJS.ProcessEnv; quiet?: boolean };

/** Starts a long-running child in its own process group; `stopAll` ends it. */
export function startProcess(command: string, args: string[], { cwd, env, quiet = true }: SpawnArgs): ChildProcess {
  const child = spawn(command, args, {
    cwd,
    env: env ?? process.env,
    detached: true,
    stdio: ["ignore", quiet ? "pipe" : "inherit", quiet ? "pipe" : "inherit"],
  });
  running.add(child);
  child.once("exit", () => running.delete(child));
  return child;
}

/** Sends SIGTERM to the child's whole group, then SIGKILL after `graceMs` if it is still there. */
export async function stopProcess(child: ChildProcess, graceMs = 3000): Promise<void> {
  if (child.pid === undefined || child.exitCode !== null || child.signalCode !== null) {
    running.delete(child);
    return;
  }
  const exited = new Promise<void>((resolve) => child.once("exit", () => resolve()));
  signalGroup(child, "SIGTERM");
  const timer = setTimeout(() => signalGroup(child, "SIGKILL"), graceMs);
  await Promise.race([exited, new Promise((r) => setTimeout(r, graceMs + 1000))]);
  clearTimeout(timer);
  // The group leader may be gone while a grandchild lingers: make sure of the whole group.
  signalGroup(child, "SIGKILL");
  running.delete(child);
}

function signalGroup(child: ChildProcess, signal: NodeJS.Signals) {
  try {
    process.kill(-child.pid!, signal);
  } catch {
    // Already gone.
  }
}

/** Ends every child still running (used in `finally` and by the signal handlers). */
export async function stopAll(): Promise<void> {
  await Promise.all([...running].map((child) => stopProcess(child)));
}

/** Synchronous last resort for `exit` handlers, where nothing can be awaited. */
export function killAllNow(): void {
  for (const child of running) signalGroup(child, "SIGKILL");
  running.clear();
}

export type RunResult = { code: number | null; stdout: string; stderr: string; timedOut: boolean };

/** Runs a command to completion with a time limit; the whole group is killed when time runs out. */
export async function runToEnd(
  command: string,
  args: string[],
  opts: SpawnArgs & { timeoutMs: number },
): Promise<RunResult> {
  const child = startProcess(command, args, { ...opts, quiet: true });
  let stdout = "";
  let stderr = "";
  child.stdout?.on("data", (chunk: Buffer) => (stdout += chunk.toString()));
  child.stderr?.on("data", (chunk: Buffer) => (stderr += chunk.toString()));
  let timedOut = false;
  const timer = setTimeout(() => {
    timedOut = true;
    void stopProcess(child, 1000);
  }, opts.timeoutMs);
  const code = await new Promise<number | null>((resolve) => {
    child.once("error", () => resolve(-1));
    child.once("exit", (exitCode) => resolve(exitCode));
  });
  clearTimeout(timer);
  running.delete(child);
  return { code, stdout, stderr, timedOut };
}

/**
 * A TCP port that was free on 127.0.0.1 a moment ago. With BENCH_PORTS=first-last (e.g.
 * 3340-3360) ports come from that range only, handed out in turn so two calls in a row never get
 * the same one; otherwise the system picks any free port.
 */
export async function freePort(): Promise<number> {
  const range = /^(\d+)-(\d+)$/.exec(process.env.BENCH_PORTS ?? "");
  if (!range) return listenOnce(0);
  const [first, last] = [Number(range[1]), Number(range[2])];
  const size = last - first + 1;
  for (let tried = 0; tried < size; tried++) {
    const port = first + ((nextInRange + tried) % size);
    const free = await listenOnce(port).then(
      () => true,
      () => false,
    );
    if (free) {
      nextInRange = (port - first + 1) % size;
      return port;
    }
  }
  throw new Error(`No free port left in BENCH_PORTS=${process.env.BENCH_PORTS}.`);
}

let nextInRange = 0;

function listenOnce(port: number): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = createServer();
    server.once("error", reject);
    server.listen(port, "127.0.0.1", () => {
      const address = server.address();
      const bound = typeof address === "object" && address ? address.port : 0;
      server.close(() => resolve(bound));
    });
  });
}

/**
 * CPU seconds (user + system) used so far by every live process in a process group, from /proc
 * (Linux only). A group started by `startProcess` holds the shell, tsx and the Node processes under it.
 */
export async function groupCpuSeconds(pgid: number): Promise<number> {
  const { readdir, readFile } = await import("node:fs/promises");
  let ticks = 0;
  for (const entry of await readdir("/proc")) {
    if (!/^\d+$/.test(entry)) continue;
    try {
      const stat = await readFile(`/proc/${entry}/stat`, "utf8");
      // Fields after the command name (which may hold spaces) start after the last ")".
      const fields = stat.slice(stat.lastIndexOf(")") + 2).split(" ");
      // fields[0] is field 3 (state): pgrp is field 5, utime 14, stime 15.
      if (Number(fields[2]) !== pgid) continue;
      ticks += Number(fields[11]) + Number(fields[12]);
    } catch {
      // The process ended while we looked.
    }
  }
  return ticks / CLOCK_TICKS;
}

/** USER_HZ: 100 on every Linux this runs on (`getconf CLK_TCK`). */
const CLOCK_TICKS = 100;

/** Rejects after `ms` with a message naming the step, so one stuck step cannot hold the run. */
export async function withTimeout<T>(label: string, ms: number, work: () => Promise<T>): Promise<T> {
  let timer: NodeJS.Timeout | undefined;
  const limit = new Promise<never>((_, reject) => {
    timer = setTimeout(() => reject(new Error(`${label} took longer than ${Math.round(ms / 1000)} s`)), ms);
  });
  try {
    return await Promise.race([work(), limit]);
  } finally {
    clearTimeout(timer);
  }
}

/** Resident memory of a process in MiB, from /proc (Linux only); null when unreadable. */
export async function residentMiB(pid: number): Promise<number | null> {
  const { readFile } = await import("node:fs/promises");
  try {
    const status = await readFile(`/proc/${pid}/status`, "utf8");
    const kib = Number(/^VmRSS:\s+(\d+)\s+kB/m.exec(status)?.[1]);
    return Number.isFinite(kib) ? kib / 1024 : null;
  } catch {
    return null;
  }
}

/** CPU seconds (user + system) one process has used so far, from /proc; null when it is gone. */
export async function processCpuSeconds(pid: number): Promise<number | null> {
  const { readFile } = await import("node:fs/promises");
  try {
    const stat = await readFile(`/proc/${pid}/stat`, "utf8");
    const fields = stat.slice(stat.lastIndexOf(")") + 2).split(" ");
    return (Number(fields[11]) + Number(fields[12])) / CLOCK_TICKS;
  } catch {
    return null;
  }
}
