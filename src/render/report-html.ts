// One self-contained HTML page from already rendered pieces (inline SVG plots, tables, data-URL
// thumbnails). Browser-safe: strings in, a string out; no file access, no scripts, no links out.

export interface ReportTable {
  caption?: string;
  head: string[];
  rows: Array<Array<string | number>>;
  /** Right-align these columns (numbers). */
  numeric?: number[];
}

export interface ReportSection {
  id: string;
  title: string;
  /** A short paragraph under the title (plain text). */
  intro?: string;
  /** Inline SVG documents (already rendered). */
  figures?: string[];
  tables?: ReportTable[];
  /** Images as data URLs with captions. */
  thumbnails?: Array<{ caption: string; src: string }>;
}

export interface ReportContent {
  title: string;
  /** One line under the title (folder, command). */
  subtitle: string;
  /** Shown in a box at the top when the data are synthetic. */
  syntheticNote?: string;
  sections: ReportSection[];
  footer: string;
}

export function escapeHtml(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!);
}

const STYLE = `
:root { --ink: #101828; --muted: #475467; --line: #e4e7ec; --wash: #f8f9fb; --accent: #3b5b92; }
* { box-sizing: border-box; }
body { margin: 0; font: 14px/1.5 Helvetica, Arial, sans-serif; color: var(--ink); background: #fff; }
header { padding: 20px 32px 12px; border-bottom: 3px solid var(--accent); }
header h1 { margin: 0; font-size: 22px; }
header p { margin: 4px 0 0; color: var(--muted); }
nav { padding: 8px 32px; background: var(--wash); border-bottom: 1px solid var(--line); font-size: 13px; }
nav a { color: var(--accent); margin-right: 14px; text-decoration: none; }
main { padding: 8px 32px 32px; max-width: 1400px; }
section { margin-top: 22px; }
h2 { font-size: 17px; margin: 0 0 6px; padding-bottom: 4px; border-bottom: 1px solid var(--line); }
.synthetic { margin: 16px 32px 0; padding: 10px 14px; border-left: 4px solid #c8741a; background: #fff7ed; }
.synthetic strong { display: block; margin-bottom: 2px; }
.figures { display: flex; flex-wrap: wrap; gap: 18px; align-items: flex-start; }
.figures svg { max-width: 100%; height: auto; }
table { border-collapse: collapse; margin: 8px 0 4px; font-size: 13px; }
caption { text-align: left; font-weight: 600; padding-bottom: 4px; white-space: nowrap; }
th, td { border-bottom: 1px solid var(--line); padding: 3px 10px 3px 0; text-align: left; vertical-align: top; }
th { color: var(--muted); font-weight: 600; }
td.num { text-align: right; font-variant-numeric: tabular-nums; }
td code { font-size: 12px; }
.tables { display: flex; flex-wrap: wrap; gap: 28px; align-items: flex-start; }
.thumbs { display: flex; flex-wrap: wrap; gap: 12px; }
.thumbs figure { margin: 0; width: 132px; font-size: 12px; color: var(--muted); }
.thumbs img { width: 132px; height: 132px; image-rendering: pixelated; border: 1px solid var(--line); display: block; }
footer { padding: 12px 32px; color: var(--muted); font-size: 12px; border-top: 1px solid var(--line); }
`;

function table(t: ReportTable): string {
  const num = new Set(t.numeric ?? []);
  const head = t.head.map((h) => `<th>${escapeHtml(h)}</th>`).join("");
  const rows = t.rows.map((r) => "<tr>" + r.map((c, k) => `<td${num.has(k) ? ' class="num"' : ""}>${escapeHtml(String(c))}</td>`).join("") + "</tr>").join("\n");
  return `<table>${t.caption ? `<caption>${escapeHtml(t.caption)}</caption>` : ""}<thead><tr>${head}</tr></thead><tbody>\n${rows}\n</tbody></table>`;
}

/** The whole page. SVGs are inlined as given (they come from our own renderer). */
export function reportHtml(c: ReportContent): string {
  const nav = c.sections.map((s) => `<a href="#${escapeHtml(s.id)}">${escapeHtml(s.title)}</a>`).join("");
  const sections = c.sections.map((s) => {
    const parts = [`<section id="${escapeHtml(s.id)}"><h2>${escapeHtml(s.title)}</h2>`];
    if (s.intro) parts.push(`<p>${escapeHtml(s.intro)}</p>`);
    if (s.figures?.length) parts.push(`<div class="figures">${s.figures.map((f) => `<figure style="margin:0">${f}</figure>`).join("\n")}</div>`);
    if (s.tables?.length) parts.push(`<div class="tables">${s.tables.map(table).join("\n")}</div>`);
    if (s.thumbnails?.length) {
      parts.push(`<div class="thumbs">${s.thumbnails.map((t) =>
        `<figure><img alt="${escapeHtml(t.caption)}" src="${t.src}"><figcaption>${escapeHtml(t.caption)}</figcaption></figure>`).join("\n")}</div>`);
    }
    parts.push("</section>");
    return parts.join("\n");
  }).join("\n");
  return `<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escapeHtml(c.title)}</title>
<style>${STYLE}</style>
</head>
<body>
<header><h1>${escapeHtml(c.title)}</h1><p>${escapeHtml(c.subtitle)}</p></header>
${c.syntheticNote ? `<div class="synthetic"><strong>Synthetic data</strong>${escapeHtml(c.syntheticNote)}</div>` : ""}
<nav>${nav}</nav>
<main>
${sections}
</main>
<footer>${escapeHtml(c.footer)}</footer>
</body>
</html>
`;
}
