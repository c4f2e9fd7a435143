// The browser page in a real browser: Debian's Chromium driven by playwright-core, the built page
// (dist-web/) served on 127.0.0.1. Frames are generated (the demo sweep) and the page's numbers
// are checked against analyzeFrame run here on the same bytes with the same options.
import { existsSync } from "node:fs";
import { mkdtemp, readFile, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { BrowserContext, Page } from "playwright-core";
import { analyzeFrame, csvCell, demoSweep, encodeNpy, encodePng, frameRow, sourceFromBytes, type Cell, type FrameOptions } from "../../src/index";
import { serveStatic } from "../../web/serve";

const CHROMIUM = "/usr/bin/chromium";
const DIST = fileURLToPath(new URL("../../dist-web", import.meta.url));
// In CI the browser must be there (.ci/run installs it); elsewhere the suite is skipped without it.
const run = existsSync(CHROMIUM) || Boolean(process.env.CI);

const demo = demoSweep({ size: 128, frames: 6 });
const frames = demo.fields.map((_, k) => demo.frame(k));
// Frames 0..3 as PNG files, frames 4..5 as one .npy stack (read frame by frame in the page).
const files = [
  ...frames.slice(0, 4).map((f, k) => ({ name: `sweep_${k + 1}.png`, mimeType: "image/png", buffer: Buffer.from(encodePng(f)) })),
  { name: "sweep_9_stack.npy", mimeType: "application/octet-stream", buffer: Buffer.from(encodeNpy(frames.slice(4))) },
];
const table = "frame,H (mT)\n" + demo.fields.map((h, k) => `${k},${h}`).join("\n") + "\n";
const options: FrameOptions = { threshold: demo.threshold, pixelSize: demo.pixelSize, unit: demo.unit, minDomainArea: 4, connectivity: 8, boundary: "open" };

/** The rows the command line would write for these files, computed in this process. */
async function nodeRows(): Promise<Array<Array<[string, Cell]>>> {
  const source = sourceFromBytes(files.map((f) => ({ name: f.name, bytes: new Uint8Array(f.buffer) })));
  const rows: Array<Array<[string, Cell]>> = [];
  for (let k = 0; k < source.count; k++) {
    const r = analyzeFrame(await source.read(k), options);
    rows.push([["frame", k], ["source", source.describe(k)], ["field_mT", demo.fields[k]!], ...frameRow(r)]);
  }
  return rows;
}

function parseCsv(text: string): string[][] {
  // The page's cells hold no quotes or commas except in "source", which holds none here.
  return text.trim().split("\n").map((line) => line.split(","));
}

/** Cells that differ beyond the CSV's 10 significant digits, as "frame k column: page vs node". */
function differences(page: string[][], expected: Array<Array<[string, Cell]>>): string[] {
  const out: string[] = [];
  const header = page[0]!;
  expect(header).toEqual(expected[0]!.map(([k]) => k));
  expected.forEach((row, k) => {
    row.forEach(([name, v], c) => {
      const got = page[k + 1]?.[c];
      const want = csvCell(v);
      if (got === want) return;
      const a = Number(got), b = Number(want);
      if (got !== "" && want !== "" && Math.abs(a - b) <= 1e-9 * Math.max(1, Math.abs(b))) return;
      out.push(`frame ${k} ${name}: page ${got} vs node ${want}`);
    });
  });
  return out;
}

async function download(page: Page, button: string): Promise<string> {
  const [dl] = await Promise.all([page.waitForEvent("download"), page.click(button)]);
  return readFile((await dl.path())!, "utf8");
}

async function finished(page: Page, analyzed: number, of: number): Promise<void> {
  await page.waitForFunction(([a, n]) => document.body.dataset.state === "done"
    && new RegExp(`Analyzed ${a} of ${n} frame`).test(document.getElementById("status")!.textContent ?? "")
    && document.body.dataset.view !== "loading", [analyzed, of] as const, { timeout: 30_000 });
}

describe.skipIf(!run)("the browser page", () => {
  let context: BrowserContext;
  let page: Page;
  let close: () => Promise<void>;
  let shots: string;
  let profile: string;

  beforeAll(async () => {
    if (!existsSync(join(DIST, "index.html"))) throw new Error(`${DIST}/index.html is missing: run \`npm run build\` first`);
    const { chromium } = await import("playwright-core");
    const { server, url } = await serveStatic(DIST);
    close = () => new Promise((ok) => server.close(() => ok()));
    profile = await mkdtemp(join(tmpdir(), "domtopo-chromium-"));
    shots = process.env.DOMTOPO_SCREENSHOTS ?? await mkdtemp(join(tmpdir(), "domtopo-page-"));
    context = await chromium.launchPersistentContext(profile, {
      executablePath: CHROMIUM, headless: true, acceptDownloads: true, viewport: { width: 1366, height: 768 },
      args: ["--no-sandbox", "--disable-gpu", "--disable-background-networking", "--disable-component-update", "--disable-sync", "--no-first-run"],
    });
    page = context.pages()[0] ?? await context.newPage();
    const errors: string[] = [];
    page.on("pageerror", (e) => errors.push(e.message));
    // Offline: every network request goes to the test's own server (blob: downloads are local).
    await context.route(/^(?!http:\/\/127\.0\.0\.1:|blob:|data:)/, (route) => { errors.push(`outside request: ${route.request().url()}`); return route.abort(); });
    await page.goto(url);
    await page.waitForSelector("#files");
    expect(errors).toEqual([]);
  });

  afterAll(async () => {
    await context?.close();
    await close?.();
    if (profile) await rm(profile, { recursive: true, force: true });
  });

  it("analyzes PNG frames and a .npy stack in workers to the same numbers as analyzeFrame in Node", async () => {
    await page.selectOption("#threshold-mode", "level");
    await page.fill("#threshold-level", String(demo.threshold));
    await page.fill("#pixel-size", String(demo.pixelSize));
    await page.fill("#unit", demo.unit);
    await page.fill("#min-area", "4");
    await page.setInputFiles("#table", { name: "field.csv", mimeType: "text/csv", buffer: Buffer.from(table) });
    await page.setInputFiles("#files", files);
    await finished(page, 6, 6);

    const expected = await nodeRows();
    expect(differences(parseCsv(await download(page, "#save-frames")), expected)).toEqual([]);

    // The numbers shown for the frame on view are those of frame 0.
    const shown = await page.$eval("#frame-numbers tr[data-column=magnetization] td", (td) => td.textContent);
    expect(shown).toBe(csvCell(expected[0]!.find(([k]) => k === "magnetization")![1]));

    // One domain row per domain of every frame, after a header.
    const domains = (await download(page, "#save-domains")).trim().split("\n");
    const total = expected.reduce((s, row) => s + Number(row.find(([k]) => k === "up_domains")![1]) + Number(row.find(([k]) => k === "down_domains")![1]), 0);
    expect(domains.length).toBe(total + 1);

    const manifest = JSON.parse(await download(page, "#save-manifest"));
    expect(manifest.options).toMatchObject({ threshold: demo.threshold, pixelSize: 10, unit: "nm", minDomainArea: 4 });
    expect(manifest.inputs.map((f: { name: string; frames: number }) => [f.name, f.frames])).toEqual(files.map((f, k) => [f.name, k < 4 ? 1 : 2]));
    expect(await download(page, "#save-report")).toContain("<svg");

    // The overlay is drawn: many pixels, several kind colours.
    const colours = await page.$eval("#frame-canvas", (c) => {
      const canvas = c as HTMLCanvasElement;
      const px = canvas.getContext("2d")!.getImageData(0, 0, canvas.width, canvas.height).data;
      const seen = new Set<number>();
      let opaque = 0;
      for (let i = 0; i < px.length; i += 4) { if (px[i + 3]! > 0) opaque++; seen.add((px[i]! << 16) | (px[i + 1]! << 8) | px[i + 2]!); }
      return { width: canvas.width, opaque, colours: seen.size };
    });
    expect(colours.width).toBeGreaterThanOrEqual(128);
    expect(colours.opaque).toBe(colours.width * colours.width);
    expect(colours.colours).toBeGreaterThanOrEqual(3);
    expect(await page.$eval("#spectrum-canvas", (c) => (c as HTMLCanvasElement).width)).toBe(128);
    expect(await page.textContent("#loop")).toContain("coercive field Hc");

    // A click on a point of the magnetization plot opens that frame.
    await page.locator("#plot-magnetization .mark-symbol path").nth(3).click();
    await page.waitForFunction(() => (document.getElementById("frame-index") as HTMLInputElement).value === "3" && document.body.dataset.view === "ready");
    expect(await page.textContent("#frame-where")).toBe("sweep_4.png");

    await page.screenshot({ path: join(shots, "laptop-1366x768.png") });
    await page.setViewportSize({ width: 2560, height: 1440 });
    // After layout (two frames), the plots are drawn again for the wider panel when it changed.
    await page.evaluate(() => new Promise((ok) => requestAnimationFrame(() => requestAnimationFrame(ok))));
    await page.waitForFunction(() => document.getElementById("plots")!.dataset.drawn === "yes");
    await page.screenshot({ path: join(shots, "wide-2560x1440.png") });
    await page.setViewportSize({ width: 1366, height: 768 });
    console.log(`screenshots in ${shots}`);
  });

  it("names a corrupt file and its frame, and keeps working for the next files", async () => {
    const good = files[0]!;
    const flipped = Buffer.from(good.buffer);
    for (let i = 60; i < flipped.length - 20; i++) flipped[i]! ^= 0x5a; // a damaged IDAT chunk
    const truncated = good.buffer.subarray(0, Math.floor(good.buffer.length * 0.6));
    await page.setInputFiles("#files", [
      good, { name: "sweep_2_damaged.png", mimeType: "image/png", buffer: flipped },
      { name: "sweep_3_cut.png", mimeType: "image/png", buffer: truncated },
    ]);
    await finished(page, 1, 2);
    const problems = await page.textContent("#problem-list");
    expect(problems).toContain("frame 1 (sweep_2_damaged.png): chunk IDAT at offset 33 is corrupt (CRC mismatch)");
    expect(problems).toContain("sweep_3_cut.png: file is truncated");
    await page.screenshot({ path: join(shots, "corrupt-1366x768.png") });

    await page.setInputFiles("#files", [files[1]!]);
    await finished(page, 1, 1);
    expect(await page.isHidden("#problems")).toBe(true);
    const csv = parseCsv(await download(page, "#save-frames"));
    const r = analyzeFrame(frames[1]!, options);
    expect(csv[1]![csv[0]!.indexOf("up_domains")]).toBe(String(r.up.domains));
  });

  it("analyzes hexagonal frames (offset rows) to the numbers of analyzeFrame with grid 'hex', drawn as hexagonal cells", async () => {
    const hex = demoSweep({ size: 64, frames: 3, grid: "hex" });
    const hexFiles = hex.fields.map((_, k) => ({ name: `hex_${k + 1}.png`, mimeType: "image/png", buffer: Buffer.from(encodePng(hex.frame(k))) }));
    await page.selectOption("#grid", "hex");
    expect(await page.isDisabled("#connectivity")).toBe(true);
    await page.setInputFiles("#table", { name: "field.csv", mimeType: "text/csv", buffer: Buffer.from("frame,H (mT)\n" + hex.fields.map((h, k) => `${k},${h}`).join("\n") + "\n") });
    await page.setInputFiles("#files", hexFiles);
    await finished(page, 3, 3);
    const hexOptions: FrameOptions = { ...options, grid: "hex" };
    const expected = hexFiles.map((f, k) => {
      const r = analyzeFrame(hex.frame(k), hexOptions);
      return [["frame", k], ["source", f.name], ["field_mT", hex.fields[k]!], ...frameRow(r)] as Array<[string, Cell]>;
    });
    expect(differences(parseCsv(await download(page, "#save-frames")), expected)).toEqual([]);
    // Hexagonal cells: the canvas is wider than the frame by half a site and not square.
    const size = await page.$eval("#frame-canvas", (c) => [(c as HTMLCanvasElement).width, (c as HTMLCanvasElement).height]);
    expect(size[0]! / size[1]!).toBeCloseTo((64.5) / (63 * Math.sqrt(3) / 2 + 2 / Math.sqrt(3)), 1);
    await page.screenshot({ path: join(shots, "hex-1366x768.png") });
    await page.selectOption("#grid", "square");
  });
});
