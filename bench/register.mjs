// Lets `node` run the TypeScript benchmark scripts directly by transpiling them with esbuild.
import { register } from "node:module";
register("./loader.mjs", import.meta.url);
