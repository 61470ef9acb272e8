#!/usr/bin/env node
// Entry of the `meltledger` command: loads the TypeScript CLI through tsx, so the CLI and the
// web app share one source tree without a separate build step.
import { register } from "tsx/esm/api";
import { pathToFileURL } from "node:url";
import path from "node:path";
import { Buffer } from "node:buffer";

register({ tsconfig: path.join(import.meta.dirname, "..", "tsconfig.json") });
const { main } = await import(pathToFileURL(path.join(import.meta.dirname, "..", "lib", "cli", "main.ts")).href);
const code = await main(process.argv.slice(2), {
  stdout: (text) => process.stdout.write(text),
  stderr: (text) => process.stderr.write(text),
  stdin: async () => {
    const chunks = [];
    for await (const chunk of process.stdin) chunks.push(chunk);
    return Buffer.concat(chunks).toString("utf8");
  },
});
process.exitCode = code;
