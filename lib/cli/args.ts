import { parseArgs, type ParseArgsConfig } from "node:util";
import type { CliIo } from "./types";

export type ParsedCli = { ok: true; values: Record<string, string | boolean | string[] | undefined>; positionals: string[] } | { ok: false };

/** util.parseArgs with a usage message on stderr instead of a stack trace. */
export function parseCli(argv: string[], options: NonNullable<ParseArgsConfig["options"]>, io: CliIo, usage: string): ParsedCli {
  try {
    const { values, positionals } = parseArgs({ args: argv, options, allowPositionals: true, strict: true });
    return { ok: true, values: values as Record<string, string | boolean | string[] | undefined>, positionals };
  } catch (error) {
    io.stderr(`${(error as Error).message}\n\nUsage: ${usage}\n`);
    return { ok: false };
  }
}

/** Prints a server error as one line (or JSON with --json) and returns the exit code for it. */
export function reportError(io: CliIo, error: { code: string; message: string; details?: unknown }, json: boolean): number {
  if (json) io.stderr(`${JSON.stringify({ error })}\n`);
  else {
    io.stderr(`error (${error.code}): ${error.message}\n`);
    const fieldErrors = (error.details as { fieldErrors?: Record<string, string[]> } | undefined)?.fieldErrors;
    for (const [field, messages] of Object.entries(fieldErrors ?? {})) io.stderr(`  ${field}: ${messages.join("; ")}\n`);
  }
  return error.code === "internal" ? 1 : 2;
}

export type ParsedCommand = { ok: true; values: Record<string, string | boolean | string[] | undefined>; json: boolean } | { ok: false; exitCode: number };

/**
 * The prelude every option-only command shares: parse the options, answer --help with the usage
 * (exit 0), refuse stray positional arguments (exit 2), and read --json.
 */
export function parseCommand(argv: string[], options: NonNullable<ParseArgsConfig["options"]>, io: CliIo, usage: string): ParsedCommand {
  const parsed = parseCli(argv, options, io, usage);
  if (!parsed.ok) return { ok: false, exitCode: 2 };
  if (parsed.values.help === true) {
    io.stdout(`Usage: ${usage}\n`);
    return { ok: false, exitCode: 0 };
  }
  if (parsed.positionals.length > 0) {
    io.stderr(`Unexpected argument '${parsed.positionals[0]}'.\n\nUsage: ${usage}\n`);
    return { ok: false, exitCode: 2 };
  }
  return { ok: true, values: parsed.values, json: parsed.values.json === true };
}
