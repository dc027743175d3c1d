/** The browser project's setup: build the pages' script, start the Worker, stop it afterwards. */
import { execFileSync } from "node:child_process";
import { resolve } from "node:path";
import type { TestProject } from "vitest/node";
import { startWorker } from "./server.js";

declare module "vitest" {
  export interface ProvidedContext {
    baseUrl: string;
  }
}

export default async function setup(project: TestProject): Promise<() => Promise<void>> {
  const root = resolve(import.meta.dirname, "../..");
  // `npm test` has built it already (pretest); building again keeps `vitest --project browser` honest on its own.
  execFileSync("npm", ["run", "--silent", "build:static"], { cwd: root, stdio: "inherit" });
  const worker = await startWorker(root);
  project.provide("baseUrl", worker.url);
  return () => worker.stop();
}
