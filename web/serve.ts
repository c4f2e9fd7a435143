// A small static file server for the built page (dist-web/) on 127.0.0.1: `npm run serve`
// (port 8080, or PORT), also used by the browser test on a free port.
import { createServer, type Server } from "node:http";
import { readFile, stat } from "node:fs/promises";
import { extname, join, normalize, resolve, sep } from "node:path";
import { fileURLToPath } from "node:url";

const TYPES: Record<string, string> = {
  ".html": "text/html; charset=utf-8", ".js": "text/javascript; charset=utf-8", ".css": "text/css; charset=utf-8",
  ".json": "application/json", ".svg": "image/svg+xml", ".png": "image/png", ".wasm": "application/wasm",
  ".map": "application/json",
};

/** Serves `dir` on 127.0.0.1:`port` (0 = any free port); resolves once listening. */
export function serveStatic(dir: string, port = 0): Promise<{ server: Server; url: string }> {
  const root = resolve(dir);
  const server = createServer((req, res) => {
    void (async () => {
      const path = decodeURIComponent(new URL(req.url ?? "/", "http://x").pathname);
      let file = normalize(join(root, path));
      if (file !== root && !file.startsWith(root + sep)) { res.writeHead(403).end(); return; }
      try {
        if ((await stat(file)).isDirectory()) file = join(file, "index.html");
        const body = await readFile(file);
        res.writeHead(200, { "content-type": TYPES[extname(file)] ?? "application/octet-stream", "cache-control": "no-cache" });
        res.end(body);
      } catch {
        res.writeHead(404, { "content-type": "text/plain" }).end(`not found: ${path}\n`);
      }
    })();
  });
  return new Promise((ok, fail) => {
    server.once("error", fail);
    server.listen(port, "127.0.0.1", () => {
      const address = server.address();
      const p = typeof address === "object" && address ? address.port : port;
      ok({ server, url: `http://127.0.0.1:${p}/` });
    });
  });
}

if (process.argv[1] && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const dir = fileURLToPath(new URL("../dist-web", import.meta.url));
  void stat(join(dir, "index.html")).then(
    () => serveStatic(dir, Number(process.env.PORT ?? 8080)).then(({ url }) => console.log(`domtopo page at ${url} (Ctrl-C stops)`)),
    () => { console.error("dist-web/index.html is missing: run `npm run build:web` first"); process.exitCode = 1; },
  );
}
