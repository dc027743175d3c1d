/** Runs every bench/*.bench.ts in one process, so figures compare within one run. */
import { readdirSync } from "node:fs";
import { dirname, join } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";

const here = dirname(fileURLToPath(import.meta.url));
const only = process.argv[2];
for (const file of readdirSync(here).filter((f) => f.endsWith(".bench.ts")).sort()) {
  if (only && !file.includes(only)) continue;
  console.log(`\n## ${file}`);
  await import(pathToFileURL(join(here, file)).href);
}
