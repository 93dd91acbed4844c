/*
 * Debian's nginx as the bench's balancer: round robin over the app processes with upstream
 * keep-alive, the forwarded headers the app trusts behind TRUST_PROXY, and no access log. It is what
 * a production deployment puts in front, and it takes a few per cent of a core where the Node
 * balancer (scripts/balancer.ts, which the crash tests keep using) took a fifth of the machine.
 * Missing nginx is installed by scripts/ensure-nginx.sh; where that cannot be done the bench says so
 * and falls back to the Node balancer.
 */
import type { ChildProcess } from "node:child_process";
import { chmod, mkdtemp, rm, writeFile } from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import { runToEnd, startProcess, stopProcess } from "./processes";

export type NginxSite = { port: number; targets: string[] };
export type Nginx = { child: ChildProcess; stop: () => Promise<void> };

const NGINX = process.env.NGINX_PATH ?? "/usr/sbin/nginx";

/** True when nginx is there or scripts/ensure-nginx.sh could install it. */
export async function ensureNginx(root: string): Promise<boolean> {
  const result = await runToEnd("bash", ["scripts/ensure-nginx.sh"], { cwd: root, timeoutMs: 180_000 });
  if (result.code !== 0) process.stderr.write(`bench: no nginx (${result.stderr.trim()})\n`);
  return result.code === 0;
}

/** The configuration: one worker, one upstream and one listening port per site. */
export function nginxConfig(dir: string, sites: NginxSite[]): string {
  const hostPort = (origin: string) => new URL(origin).host;
  const blocks = sites.map(
    (site, i) => `
  upstream app${i} {
${site.targets.map((t) => `    server ${hostPort(t)};`).join("\n")}
    keepalive 64;
  }
  server {
    listen 127.0.0.1:${site.port};
    location / {
      proxy_pass http://app${i};
      proxy_http_version 1.1;
      proxy_set_header Connection "";
      proxy_set_header Host $http_host;
      proxy_set_header X-Forwarded-For $proxy_add_x_forwarded_for;
      proxy_set_header X-Forwarded-Proto $scheme;
      proxy_set_header X-Forwarded-Host $http_host;
    }
  }`,
  );
  return `worker_processes 1;
pid ${dir}/nginx.pid;
error_log ${dir}/error.log warn;
events { worker_connections 4096; }
http {
  access_log off;
  client_body_temp_path ${dir}/body;
  proxy_temp_path ${dir}/proxy;
  client_body_buffer_size 1m;
  client_max_body_size 80m;
  proxy_buffer_size 16k;
  proxy_buffers 32 16k;
  proxy_max_temp_file_size 0;
${blocks.join("\n")}
}
`;
}

/** Starts nginx in the foreground (its own process group, so the bench's CPU meter can read it). */
export async function startNginx(sites: NginxSite[]): Promise<Nginx> {
  const dir = await mkdtemp(path.join(os.tmpdir(), "emberwright-nginx-"));
  // Workers run as an unprivileged user when the master is root: they must reach the temp paths.
  await chmod(dir, 0o755);
  const conf = path.join(dir, "nginx.conf");
  await writeFile(conf, nginxConfig(dir, sites));
  const test = await runToEnd(NGINX, ["-t", "-p", dir, "-e", `${dir}/error.log`, "-c", conf], {
    cwd: dir,
    timeoutMs: 10_000,
  });
  if (test.code !== 0) {
    await rm(dir, { recursive: true, force: true });
    throw new Error(`nginx refused the configuration: ${test.stderr.trim()}`);
  }
  const child = startProcess(NGINX, ["-p", dir, "-e", `${dir}/error.log`, "-c", conf, "-g", "daemon off;"], {
    cwd: dir,
  });
  return {
    child,
    stop: async () => {
      await stopProcess(child);
      await rm(dir, { recursive: true, force: true });
    },
  };
}
