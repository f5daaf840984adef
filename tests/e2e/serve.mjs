// A tiny static file server for the built page, on 127.0.0.1 only.
// Usage: node serve.mjs DIR [PORT]   (PORT 0 or absent: any free port)
// Prints "listening http://127.0.0.1:PORT/" once ready.
import http from "node:http";
import fs from "node:fs";
import path from "node:path";

const TYPES = {
  ".html": "text/html; charset=utf-8",
  ".js": "text/javascript; charset=utf-8",
  ".mjs": "text/javascript; charset=utf-8",
  ".css": "text/css; charset=utf-8",
  ".json": "application/json",
  ".wasm": "application/wasm",
  ".rcx": "application/octet-stream",
  ".png": "image/png",
  ".svg": "image/svg+xml",
  ".ts": "text/plain; charset=utf-8",
};

// `onSent(path, bytes)`, when given, is told of every file sent whole.
export function serve(root, port = 0, onSent = null) {
  const base = path.resolve(root);
  const server = http.createServer((req, res) => {
    let rel;
    try {
      rel = decodeURIComponent(new URL(req.url, "http://127.0.0.1").pathname);
    } catch {
      res.writeHead(400).end("bad request");
      return;
    }
    if (rel.endsWith("/")) rel += "index.html";
    const file = path.resolve(base, "." + rel);
    if (!file.startsWith(base + path.sep)) {
      res.writeHead(403).end("forbidden");
      return;
    }
    fs.stat(file, (err, st) => {
      if (err || !st.isFile()) {
        res.writeHead(404, { "content-type": "text/plain" }).end("not found");
        return;
      }
      const headers = {
        "content-type": TYPES[path.extname(file)] || "application/octet-stream",
        "content-length": st.size,
        "cache-control": "no-cache",
        "x-content-type-options": "nosniff",
      };
      if (file.endsWith(".html")) {
        // The page's own policy (its meta tag) as a header too, where it can
        // also forbid framing.
        const meta = fs.readFileSync(file, "utf8").match(/<meta http-equiv="Content-Security-Policy" content="([^"]*)">/);
        if (meta) headers["content-security-policy"] = `${meta[1]}; frame-ancestors 'none'`;
      }
      res.writeHead(200, headers);
      if (req.method === "HEAD") return res.end();
      if (onSent) res.on("finish", () => onSent(rel, st.size));
      fs.createReadStream(file).pipe(res);
    });
  });
  return new Promise((resolve) => {
    server.listen(port, "127.0.0.1", () => resolve(server));
  });
}

if (import.meta.url === `file://${process.argv[1]}`) {
  const dir = process.argv[2];
  if (!dir) {
    console.error("usage: node serve.mjs DIR [PORT]");
    process.exit(2);
  }
  const server = await serve(dir, Number(process.argv[3] || 0));
  console.log(`listening http://127.0.0.1:${server.address().port}/`);
}
