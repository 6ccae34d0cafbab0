/**
 * Start and stop the built Next.js app as one child process (no npx chain), used by
 * `npm run demo`, the browser tests and the benchmarks alike.
 */
import { spawn, type ChildProcess } from "node:child_process";
import net from "node:net";
import path from "node:path";

export const PROJECT_ROOT = path.resolve(import.meta.dirname, "..", "..");

export async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = net.createServer();
    server.unref();
    server.on("error", reject);
    server.listen(0, "127.0.0.1", () => {
      const address = server.address();
      const port = typeof address === "object" && address ? address.port : 0;
      server.close(() => resolve(port));
    });
  });
}

export function runStep(command: string, args: string[], env: Record<string, string> = {}): Promise<void> {
  return new Promise((resolve, reject) => {
    const child = spawn(command, args, {
      cwd: PROJECT_ROOT,
      stdio: "inherit",
      env: { ...process.env, NEXT_TELEMETRY_DISABLED: "1", ...env },
    });
    child.on("error", reject);
    child.on("exit", (code) =>
      code === 0 ? resolve() : reject(new Error(`${command} ${args.join(" ")} exited with ${code}`)),
    );
  });
}

export interface RunningApp {
  url: string;
  child: ChildProcess;
  stop(): Promise<void>;
}

/** `next start` on loopback; resolves once /api/health answers 200. */
export async function startBuiltApp(opts: { port: number; env: Record<string, string>; quiet?: boolean }): Promise<RunningApp> {
  const url = `http://localhost:${opts.port}`;
  const child = spawn(
    process.execPath,
    // A long keep-alive: requests queue behind a large import on the one SQLite connection, and
    // Node's 5 s default closed waiting sockets under load (ECONNRESET in bench/load.ts).
    [path.join(PROJECT_ROOT, "node_modules/next/dist/bin/next"), "start", "-p", String(opts.port), "-H", "127.0.0.1", "--keepAliveTimeout", "120000"],
    {
      cwd: PROJECT_ROOT,
      stdio: opts.quiet ? ["ignore", "ignore", "inherit"] : "inherit",
      env: { ...process.env, NEXT_TELEMETRY_DISABLED: "1", APP_URL: url, ...opts.env, NODE_ENV: "production" },
    },
  );
  const exited = new Promise<number | null>((resolve) => child.on("exit", (code) => resolve(code)));
  const deadline = Date.now() + 60_000;
  for (;;) {
    const early = await Promise.race([exited, new Promise<"wait">((r) => setTimeout(() => r("wait"), 250))]);
    if (early !== "wait") throw new Error(`the app exited during start-up (code ${early})`);
    try {
      const res = await fetch(`${url}/api/health`);
      if (res.ok) break;
    } catch {
      /* not listening yet */
    }
    if (Date.now() > deadline) {
      child.kill("SIGKILL");
      throw new Error(`the app did not answer ${url}/api/health within 60 s`);
    }
  }
  return {
    url,
    child,
    async stop() {
      if (child.exitCode !== null) return;
      child.kill("SIGTERM");
      const timer = setTimeout(() => child.kill("SIGKILL"), 5_000);
      await exited;
      clearTimeout(timer);
    },
  };
}
