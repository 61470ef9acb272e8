/** Where a CLI command writes; injected so tests can capture output. */
export interface CliIo {
  stdout: (text: string) => void;
  stderr: (text: string) => void;
  /** All of standard input as text (commands that read a password or data from it). */
  stdin?: () => Promise<string>;
}

/** A subcommand: receives the arguments after its name, returns the process exit code. */
export type CliCommand = (argv: string[], io: CliIo) => Promise<number>;
