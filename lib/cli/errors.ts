/**
 * Errors of the command line. main.ts prints any error as ONE line `siderea: <reason>` on
 * stderr; exit code 1, or 2 for usage errors (unknown command or option, bad option value).
 */

/** An expected failure with a message fit for the user (no stack trace is printed). */
export class CliError extends Error {
  readonly exitCode: number;
  constructor(message: string, exitCode = 1) {
    super(message);
    this.name = "CliError";
    this.exitCode = exitCode;
  }
}

/** A usage error (exit code 2): unknown command, unknown option, missing or invalid option value. */
export class UsageError extends CliError {
  constructor(message: string) {
    super(message, 2);
    this.name = "UsageError";
  }
}
