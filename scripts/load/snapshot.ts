/**
 * A copy of what the Worker is built from, taken when the load test starts.
 * `wrangler dev` rebuilds and restarts the Worker whenever a watched file
 * changes; run on the working tree, an edit saved during the load test would
 * restart it mid-scenario (cold isolate, dropped requests) and the figures
 * would mix two versions of the code. The copy shares node_modules by a link.
 */
import { cpSync, mkdtempSync, rmSync, symlinkSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";

/** Everything `wrangler.toml` builds and serves from: the entry and its imports, report layout and fonts, static assets. */
const WORKER_SOURCES = ["wrangler.toml", "package.json", "tsconfig.json", "src", "reports", "static"];

export interface Snapshot {
  root: string;
  remove(): void;
}

export function snapshotWorkerSources(root: string): Snapshot {
  const copy = mkdtempSync(join(tmpdir(), "trialwright-load-"));
  try {
    for (const entry of WORKER_SOURCES) cpSync(join(root, entry), join(copy, entry), { recursive: true });
    symlinkSync(join(root, "node_modules"), join(copy, "node_modules"), "dir");
  } catch (error) {
    rmSync(copy, { recursive: true, force: true });
    throw error;
  }
  return { root: copy, remove: () => rmSync(copy, { recursive: true, force: true }) };
}
