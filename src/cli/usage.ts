// Command-line errors that are the caller's (exit code 2), shared by the commands.
import { parseArgs, type ParseArgsConfig } from "node:util";

export class UsageError extends Error {}

export type Values = Record<string, string | boolean | undefined>;

/** parseArgs with strict flags; its complaints become usage errors naming the command. */
export function parseCommand(command: string, argv: string[], options: ParseArgsConfig["options"]): { values: Values; positionals: string[] } {
  try {
    const r = parseArgs({ args: argv, options, allowPositionals: true, strict: true });
    return { values: r.values as Values, positionals: r.positionals };
  } catch (err) {
    throw new UsageError(`${command}: ${(err as Error).message}`);
  }
}

/** A numeric flag, or undefined when absent. */
export function numberFlag(flag: string, text: string | boolean | undefined): number | undefined {
  if (text === undefined) return undefined;
  const v = Number(text);
  if (typeof text !== "string" || text.trim() === "" || !Number.isFinite(v)) {
    throw new UsageError(`--${flag}: expected a number, got ${JSON.stringify(text)}`);
  }
  return v;
}
