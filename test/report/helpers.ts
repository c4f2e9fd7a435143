// Shared by the report suites: headless vega modules, a strict XML check, the built CLI.
import * as vega from "vega";
import * as vegaLite from "vega-lite";
import { XMLValidator, XMLParser } from "fast-xml-parser";
import { spawnSync } from "node:child_process";
import { join } from "node:path";
import type { VegaModules } from "../../src/render/svg";

export const modules = { vega, vegaLite } as unknown as VegaModules;

/** Throws unless `text` is well-formed XML (balanced tags, quoted attributes, one root). */
export function checkWellFormed(text: string): void {
  const r = XMLValidator.validate(text);
  if (r !== true) throw new Error(`not well-formed XML: ${r.err.msg} at line ${r.err.line}`);
}

/** Every element named `tag` anywhere in a parsed SVG, with its attributes (prefix "@"). */
export function elements(svg: string, tag: string): Array<Record<string, any>> {
  const tree = new XMLParser({ ignoreAttributes: false, attributeNamePrefix: "@" }).parse(svg);
  const found: Array<Record<string, any>> = [];
  const walk = (node: any, name: string) => {
    if (Array.isArray(node)) { node.forEach((n) => walk(n, name)); return; }
    if (node === null || typeof node !== "object") return;
    if (name === tag) found.push(node);
    for (const [k, v] of Object.entries(node)) if (!k.startsWith("@")) walk(v, k);
  };
  walk(tree, "");
  return found;
}

/** The `g` groups of one mark kind ("line", "rect", ...), as vega names them in SVG. */
export function markGroups(svg: string, kind: string): Array<Record<string, any>> {
  return elements(svg, "g").filter((g) => typeof g["@class"] === "string" && g["@class"].startsWith(`mark-${kind} role-mark`));
}

/** All text content of `text` elements. */
export function texts(svg: string): string[] {
  return elements(svg, "text").map((t) => (typeof t === "object" ? String(t["#text"] ?? "") : String(t)));
}

// These run the built command (npm test builds first), as a user would.
const bin = join(__dirname, "..", "..", "bin", "domtopo.js");
export function run(args: string[]) {
  const r = spawnSync(process.execPath, [bin, ...args], { encoding: "utf8" });
  return { code: r.status, out: r.stdout, err: r.stderr };
}
