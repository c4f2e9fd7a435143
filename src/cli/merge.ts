// `domtopo merge`: the shards of one sharded `analyze` run into the tables of one unbroken run.
import { resolve } from "node:path";
import { mergeShards } from "../node/merge";
import { UsageError, parseCommand } from "./usage";

export const MERGE_HELP = `Usage: domtopo merge <shard folders...> --out DIR [options]

Merges the shards of one run (each written by 'domtopo analyze ... --shard K/N --out RUN' into
RUN/shard-K-of-N) into DIR: frames.csv, frames.ndjson, domains.csv and tracks.csv as one
unsharded run would have written them, byte for byte, and DIR/run.json listing the shards.
A folder holding shard-K-of-N folders stands for all of them, in order.

The shards' run records must agree on everything but times, failed frames and the shard itself
(inputs with sizes and SHA-256 hashes, options, fields, tracking, version); the first entry that
differs is named. Their frame ranges must cover the movie exactly once; missing, repeated and
overlapping frames are named. With tracking, every cut is replayed: the event cells of each
shard's first frame and every track's id, birth, lifetime and end are those of an unsharded run.

Options:
  --out DIR             output folder (may be the run folder that holds the shards)
  --json                print the merge summary as JSON on stdout
  --quiet               no summary
  -h, --help            this help

Exit codes: 0 merged; 1 the shards do not fit together or cannot be read (nothing is written
then); 2 bad command line; 3 merged, but some frames had failed (listed in run.json).`;

export async function runMerge(argv: string[]): Promise<number> {
  const { values, positionals } = parseCommand("merge", argv, {
    out: { type: "string" }, json: { type: "boolean" }, quiet: { type: "boolean" }, help: { type: "boolean", short: "h" },
  });
  if (values.help) { process.stdout.write(MERGE_HELP + "\n"); return 0; }
  if (positionals.length === 0) throw new UsageError("merge: expected the shard folders (see domtopo merge --help)");
  const out = values.out as string | undefined;
  if (!out) throw new UsageError("merge: expected --out DIR");
  const summary = mergeShards({ shards: positionals, out });
  if (values.json) process.stdout.write(JSON.stringify(summary) + "\n");
  else if (!values.quiet) {
    process.stderr.write(`Merged ${summary.shards.length} shard${summary.shards.length === 1 ? "" : "s"} ` +
      `(${summary.frames} frames${summary.tracks ? `, ${summary.tracks} tracks` : ""}) into ${resolve(out)}` +
      `${summary.failed.length ? `; ${summary.failed.length} frame${summary.failed.length === 1 ? "" : "s"} had failed` : ""}\n`);
  }
  return summary.failed.length > 0 ? 3 : 0;
}
