// Node module loader hook: .ts files are transpiled by esbuild on the fly; .js
// specifiers that name a .ts source are resolved to it.
import { transform } from "esbuild";
import { readFile } from "node:fs/promises";
import { existsSync } from "node:fs";
import { fileURLToPath } from "node:url";

export async function resolve(specifier, context, next) {
  if (specifier.endsWith(".js") && context.parentURL && !specifier.includes("node_modules")) {
    try {
      const url = new URL(specifier, context.parentURL);
      const ts = fileURLToPath(url).replace(/\.js$/, ".ts");
      if (url.protocol === "file:" && existsSync(ts)) return next(url.href.replace(/\.js$/, ".ts"), context);
    } catch {
      // not a relative file specifier
    }
  }
  return next(specifier, context);
}

export async function load(url, context, next) {
  // Fonts are binary modules in the Worker (wrangler's Data rule): the same ArrayBuffer here.
  if (url.endsWith(".ttf")) {
    const bytes = await readFile(fileURLToPath(url));
    return { format: "module", source: `export default Uint8Array.from(atob(${JSON.stringify(bytes.toString("base64"))}), (c) => c.charCodeAt(0)).buffer;`, shortCircuit: true };
  }
  if (url.endsWith(".ts")) {
    const source = await readFile(fileURLToPath(url), "utf8");
    const { code } = await transform(source, { loader: "ts", format: "esm", target: "node20", sourcefile: url });
    return { format: "module", source: code, shortCircuit: true };
  }
  return next(url, context);
}
