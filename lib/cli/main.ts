/**
 * Siderea command line: `npm run --silent cli -- <command> [options]`.
 *
 * Commands: convert, exposure (lib/cli/commands/convert.ts, exposure.ts), scan, dipole
 * (commands/scan.ts, dipole.ts). Each command module exports `run(argv): Promise<void>`. They
 * are imported by literal dynamic import() when their command is chosen, so `convert` does not
 * load the scan machinery, and a module missing from a build reports "not available".
 * Errors print ONE line `siderea: <reason>` on stderr; exit code 1, or 2 for usage errors.
 */
import { CliError, UsageError } from "./errors";

type CommandModule = { run(argv: string[]): Promise<void> };

const COMMANDS: Record<string, { summary: string; load: () => Promise<CommandModule> }> = {
  convert: { summary: "event CSV -> CSV id,ra,dec,l,b (ICRS and galactic degrees)", load: () => import("./commands/convert.js") },
  exposure: { summary: "Sommers relative exposure curve as JSON", load: () => import("./commands/exposure.js") },
  scan: { summary: "top-hat window scan with Li-Ma significances", load: () => import("./commands/scan.js") },
  dipole: { summary: "Rayleigh first harmonic and dipole", load: () => import("./commands/dipole.js") },
  reproduce: { summary: "rerun a saved analysis from its bundle and events CSV; exit 3 on a mismatch", load: () => import("./commands/reproduce.js") },
};

const USAGE = `usage: siderea <${Object.keys(COMMANDS).join("|")}> [options]   (siderea <command> --help for its options)`;

/** Dispatches argv (without node and script) to a command; resolves to the exit code. */
export async function main(argv: string[]): Promise<number> {
  const [name, ...rest] = argv;
  if (name === undefined || name === "--help" || name === "-h" || name === "help") {
    (name === undefined ? process.stderr : process.stdout).write(`${USAGE}\n${Object.entries(COMMANDS).map(([k, c]) => `  ${k.padEnd(9)} ${c.summary}`).join("\n")}\n`);
    return name === undefined ? 2 : 0;
  }
  const command = Object.hasOwn(COMMANDS, name) ? COMMANDS[name] : undefined;
  try {
    if (!command) throw new UsageError(`unknown command "${name}"; ${USAGE}`);
    let mod: CommandModule;
    try {
      mod = await command.load();
    } catch (e) {
      const code = (e as NodeJS.ErrnoException).code;
      if (code === "ERR_MODULE_NOT_FOUND" || code === "MODULE_NOT_FOUND") throw new CliError(`command "${name}" is not available in this build`);
      throw e;
    }
    if (typeof mod.run !== "function") throw new CliError(`command "${name}" is not available in this build`);
    await mod.run(rest);
    // A command may set its own exit code (reproduce: 3 on a mismatch).
    return typeof process.exitCode === "number" ? process.exitCode : 0;
  } catch (e) {
    const exitCode = e instanceof CliError ? e.exitCode : 1;
    const reason = e instanceof Error ? e.message : String(e);
    process.stderr.write(`siderea: ${reason.split("\n")[0]}\n`);
    if (!(e instanceof CliError) && process.env.SIDEREA_DEBUG) process.stderr.write(`${(e as Error).stack ?? ""}\n`);
    return exitCode;
  }
}

// stdout closed early (e.g. piped into `head`): stop quietly
process.stdout.on("error", (e: NodeJS.ErrnoException) => { if (e.code === "EPIPE") process.exit(0); });

const code = await main(process.argv.slice(2));
process.exitCode = code;
