// Rendering Vega-Lite specs to SVG text without a browser: compile with vega-lite, run a headless
// vega View (renderer 'none') and ask it for SVG. The vega modules are passed in, so this file
// imports neither them nor anything of Node (the caller loads them, e.g. with import()).
import type { PlotSpec } from "./plots";

/** The parts of the `vega` and `vega-lite` modules used here. */
export interface VegaModules {
  vega: {
    parse(spec: unknown, config?: unknown): unknown;
    View: new (runtime: any, options?: { renderer?: string; logLevel?: number }) => {
      toSVG(scaleFactor?: number): Promise<string>;
      finalize(): void;
    };
  };
  vegaLite: { compile(spec: any): { spec: unknown } };
}

/**
 * Renders one Vega-Lite spec to an SVG string. `idPrefix` is put in front of every `id` (and the
 * references to it) so that several SVGs can share one HTML page.
 */
export async function renderSvg(spec: PlotSpec, modules: VegaModules, idPrefix = ""): Promise<string> {
  const compiled = modules.vegaLite.compile(spec).spec;
  const view = new modules.vega.View(modules.vega.parse(compiled), { renderer: "none", logLevel: 0 });
  try {
    let svg = await view.toSVG();
    if (idPrefix) {
      svg = svg
        .replace(/\bid="([^"]+)"/g, `id="${idPrefix}$1"`)
        .replace(/url\(#([^)]+)\)/g, `url(#${idPrefix}$1)`)
        .replace(/href="#([^"]+)"/g, `href="#${idPrefix}$1"`);
    }
    return svg;
  } finally {
    view.finalize();
  }
}
