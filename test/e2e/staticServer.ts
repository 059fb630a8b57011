/**
 * A tiny static file server for browser tests: serves `rootDir` under `prefix` (e.g. /reports/)
 * on 127.0.0.1, so the site is checked exactly as a plain file server under a sub-path hosts it.
 */
import { createServer, type Server } from "node:http";
import { readFile, stat } from "node:fs/promises";
import { extname, join, normalize, sep } from "node:path";

const TYPES: Record<string, string> = {
  ".html": "text/html; charset=utf-8",
  ".js": "text/javascript; charset=utf-8",
  ".css": "text/css; charset=utf-8",
  ".json": "application/json; charset=utf-8",
  ".csv": "text/csv; charset=utf-8",
  ".svg": "image/svg+xml",
  ".png": "image/png",
};

export interface RunningServer {
  origin: string;
  /** Every path requested, in order (for asserting what the browser asked for). */
  requests: string[];
  close(): Promise<void>;
}

/** Starts the server on a free port. Paths outside `prefix` or the folder are 404. */
export async function serveStatic(rootDir: string, prefix: string): Promise<RunningServer> {
  const requests: string[] = [];
  const server: Server = createServer(async (req, res) => {
    const url = new URL(req.url ?? "/", "http://127.0.0.1");
    requests.push(url.pathname);
    if (!url.pathname.startsWith(prefix)) {
      res.writeHead(404).end("outside prefix");
      return;
    }
    const rel = normalize(decodeURIComponent(url.pathname.slice(prefix.length)));
    let file = join(rootDir, rel);
    if (!(file + sep).startsWith(rootDir + sep) && file !== rootDir) {
      res.writeHead(403).end();
      return;
    }
    try {
      if ((await stat(file)).isDirectory()) file = join(file, "index.html");
      const body = await readFile(file);
      res.writeHead(200, { "content-type": TYPES[extname(file)] ?? "application/octet-stream" }).end(body);
    } catch {
      res.writeHead(404).end("not found");
    }
  });
  await new Promise<void>((ok) => server.listen(0, "127.0.0.1", ok));
  const address = server.address();
  const port = typeof address === "object" && address ? address.port : 0;
  return {
    origin: `http://127.0.0.1:${port}`,
    requests,
    close: () => new Promise<void>((ok) => server.close(() => ok())),
  };
}
