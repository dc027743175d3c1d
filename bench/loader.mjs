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
  if (url.endsWith(".ts")) {
    const source = await readFile(fileURLToPath(url), "utf8");
    const { code } = await transform(source, { loader: "ts", format: "esm", target: "node20", sourcefile: url });
    return { format: "module", source: code, shortCircuit: true };
  }
  return next(url, context);
}
