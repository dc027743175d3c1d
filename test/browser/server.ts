/**
 * Starts the Worker with `wrangler dev` on free local ports and a throwaway
 * persistence directory, the way a user runs it; used by the browser tests, the
 * screenshot script and the load test.
 */
import { type ChildProcess, spawn } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import { createServer } from "node:net";
import { tmpdir } from "node:os";
import { join } from "node:path";

export interface RunningWorker {
  url: string;
  /** Process group of `wrangler dev` and the runtime processes it starts (the load test reads their CPU time). */
  processGroup: number;
  stop(): Promise<void>;
}

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = createServer();
    server.unref();
    server.on("error", reject);
    server.listen(0, "127.0.0.1", () => {
      const address = server.address();
      server.close(() => (typeof address === "object" && address ? resolve(address.port) : reject(new Error("no port"))));
    });
  });
}

async function waitUntilServing(url: string, child: ChildProcess, log: () => string, timeoutMs: number): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    if (child.exitCode !== null) throw new Error(`wrangler dev exited with code ${child.exitCode}:\n${log()}`);
    try {
      const response = await fetch(`${url}/api/v1/health`);
      if (response.ok) return;
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`wrangler dev did not answer within ${timeoutMs} ms:\n${log()}`);
}

export async function startWorker(root: string): Promise<RunningWorker> {
  const [port, inspectorPort] = [await freePort(), await freePort()];
  const state = mkdtempSync(join(tmpdir(), "trialwright-browser-"));
  const child = spawn(process.execPath, [
    join(root, "node_modules/wrangler/bin/wrangler.js"), "dev",
    "--ip", "127.0.0.1", "--port", String(port), "--inspector-port", String(inspectorPort),
    "--persist-to", state, "--show-interactive-dev-session=false", "--log-level", "warn",
  ], {
    cwd: root,
    env: { ...process.env, WRANGLER_SEND_METRICS: "false", CI: "1", NO_COLOR: "1" },
    stdio: ["ignore", "pipe", "pipe"],
    detached: true,
  });
  let output = "";
  child.stdout?.on("data", (d: Buffer) => { output = (output + d.toString()).slice(-8000); });
  child.stderr?.on("data", (d: Buffer) => { output = (output + d.toString()).slice(-8000); });
  const url = `http://127.0.0.1:${port}`;
  const stop = async (): Promise<void> => {
    if (child.exitCode === null && child.pid) {
      const exited = new Promise((r) => child.once("exit", r));
      try {
        process.kill(-child.pid, "SIGTERM");
      } catch {
        // already gone
      }
      const timer = setTimeout(() => { try { process.kill(-child.pid!, "SIGKILL"); } catch { /* gone */ } }, 5000);
      await exited;
      clearTimeout(timer);
    }
    rmSync(state, { recursive: true, force: true });
  };
  // If the test runner is killed before its teardown, the detached server must not outlive it.
  const killGroup = (): void => {
    if (child.exitCode === null && child.pid) {
      try { process.kill(-child.pid, "SIGKILL"); } catch { /* gone */ }
    }
  };
  process.once("exit", killGroup);
  for (const signal of ["SIGINT", "SIGTERM", "SIGHUP"] as const) {
    process.once(signal, () => {
      killGroup();
      // Let the signal do what it would have done: re-raise it unless the runner handles it itself.
      if (process.listenerCount(signal) === 0) process.kill(process.pid, signal);
    });
  }
  try {
    await waitUntilServing(url, child, () => output, 60000);
  } catch (error) {
    await stop();
    throw error;
  }
  return { url, processGroup: child.pid!, stop };
}
