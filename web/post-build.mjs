// After `trunk build`: subresource integrity and Content-Security-Policy
// hashes for every page in the built folder (web/build.sh runs it).
//   - the checker's Wasm gets a gzip copy (rollcall-web_bg.wasm.gz) that the
//     worker fetches and unpacks where the browser can (DecompressionStream),
//     for servers that send files as they are;
//   - worker.js gets the SRI hashes of the checker's Wasm, of its gzip copy
//     and of the workbook reader's Wasm, which it then fetches with them;
//   - each page's <script src> and stylesheet <link> get `integrity`, and an
//     import map gives the integrity of every module they import;
//   - every inline <script> (the import map included) and <style> is hashed
//     into the page's CSP meta tag, which must hold no 'unsafe-inline' and no
//     'unsafe-eval'.
// Usage: node web/post-build.mjs [DIST]
import crypto from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import zlib from "node:zlib";

const HERE = path.dirname(new URL(import.meta.url).pathname);
const DIST = path.resolve(process.argv[2] || path.join(HERE, "dist"));

function die(msg) {
  console.error(`post-build: ${msg}`);
  process.exit(1);
}

export const sri = (bytes) => `sha384-${crypto.createHash("sha384").update(bytes).digest("base64")}`;
export const cspHash = (text) => `'sha256-${crypto.createHash("sha256").update(text, "utf8").digest("base64")}'`;

/** Add source hashes to directives of a CSP; refuse the unsafe keywords. */
export function withHashes(policy, add) {
  const directives = policy
    .split(";")
    .map((d) => d.trim())
    .filter(Boolean)
    .map((d) => d.split(/\s+/));
  for (const [name, hashes] of Object.entries(add)) {
    if (!hashes.length) continue;
    const at = directives.findIndex((x) => x[0] === name);
    if (at < 0) die(`the CSP has no ${name} directive to add hashes to`);
    // Hashes of an earlier run are dropped: the page's inline parts are hashed anew.
    const d = directives[at].filter((t) => !/^'sha(256|384|512)-/.test(t));
    directives[at] = d;
    for (const h of hashes) if (!d.includes(h)) d.push(h);
  }
  const text = directives.map((d) => d.join(" ")).join("; ");
  if (/'unsafe-inline'|'unsafe-eval'|'unsafe-hashes'/.test(text)) die(`the CSP allows unsafe sources: ${text}`);
  return text;
}

/** Hash inline scripts and styles of a page into its CSP meta tag. */
export function sealCsp(html, file) {
  const scripts = [...html.matchAll(/<script\b(?![^>]*\bsrc=)[^>]*>([\s\S]*?)<\/script>/g)]
    .filter((m) => !/type="text\/plain"/.test(m[0]))
    .map((m) => cspHash(m[1]));
  const styles = [...html.matchAll(/<style\b[^>]*>([\s\S]*?)<\/style>/g)].map((m) => cspHash(m[1]));
  if (/\son[a-z]+\s*=/i.test(html.replace(/<script\b[\s\S]*?<\/script>/g, ""))) die(`${file} has an inline event handler`);
  const meta = /(<meta http-equiv="Content-Security-Policy" content=")([^"]*)(">)/;
  const m = html.match(meta);
  if (!m) die(`${file} has no Content-Security-Policy meta tag`);
  return html.replace(meta, (_, a, policy, c) => a + withHashes(policy, { "script-src": scripts, "style-src": styles }) + c);
}

function main() {
  if (!fs.existsSync(DIST)) die(`no built folder at ${DIST}`);
  // 1. The worker fetches the checker's Wasm, and the workbook reader's on
  //    first use, with their integrity.
  const wasmFile = path.join(DIST, "rollcall-web_bg.wasm");
  if (!fs.existsSync(wasmFile)) die("rollcall-web_bg.wasm is not in the build");
  const wasm = fs.readFileSync(wasmFile);
  const packed = zlib.gzipSync(wasm, { level: 9 });
  if (!zlib.gunzipSync(packed).equals(wasm)) die("the gzip copy of the Wasm does not unpack to it");
  fs.writeFileSync(`${wasmFile}.gz`, packed);
  const workerFile = path.join(DIST, "worker.js");
  let worker = fs.readFileSync(workerFile, "utf8");
  for (const [name, file] of [
    ["WASM_INTEGRITY", "rollcall-web_bg.wasm"],
    ["WASM_GZ_INTEGRITY", "rollcall-web_bg.wasm.gz"],
    ["WORKBOOK_WASM_INTEGRITY", "rollcall-workbook_bg.wasm"],
  ]) {
    const target = path.join(DIST, file);
    if (!fs.existsSync(target)) die(`${file} is not in the build`);
    const slot = new RegExp(`const ${name} = "[^"]*";`);
    if (!slot.test(worker)) die(`worker.js has no ${name} line to fill in`);
    worker = worker.replace(slot, `const ${name} = "${sri(fs.readFileSync(target))}";`);
  }
  fs.writeFileSync(workerFile, worker);

  // 2. Integrity of every module the pages may import (the worker and the
  //    Wasm glue it loads with importScripts are no modules).
  const workerScripts = new Set(["worker.js", "rollcall-web.js", "rollcall-workbook.js"]);
  const modules = {};
  for (const f of fs.readdirSync(DIST).sort()) {
    if (f.endsWith(".js") && !workerScripts.has(f)) {
      modules[`./${f}`] = sri(fs.readFileSync(path.join(DIST, f)));
    }
  }
  const importMap = `<script type="importmap">${JSON.stringify({ integrity: modules })}</script>`;

  // 3. Each page: integrity on what it loads, the import map, the CSP hashes.
  const pages = fs.readdirSync(DIST).filter((f) => f.endsWith(".html"));
  for (const page of pages) {
    const file = path.join(DIST, page);
    let html = fs.readFileSync(file, "utf8");
    html = html.replace(/<script type="importmap">[\s\S]*?<\/script>\s*/g, "");
    const integrityOf = (ref) => {
      const target = path.join(DIST, ref.split(/[?#]/)[0]);
      if (!target.startsWith(DIST + path.sep) || !fs.existsSync(target)) die(`${page} loads ${ref}, which is not in the build`);
      return sri(fs.readFileSync(target));
    };
    html = html.replace(/<(script|link)\b([^>]*)>/g, (tag, name, attrs) => {
      const ref = name === "script" ? attrs.match(/\bsrc="([^"]+)"/) : /\brel="stylesheet"/.test(attrs) && attrs.match(/\bhref="([^"]+)"/);
      if (!ref || /^[a-z]+:/i.test(ref[1])) return tag;
      const slash = /\/\s*$/.test(attrs) ? " /" : "";
      const clean = attrs.replace(/\s*\/\s*$/, "").replace(/\s+integrity="[^"]*"/, "");
      return `<${name}${clean} integrity="${integrityOf(ref[1])}"${slash}>`;
    });
    const first = html.search(/<script\b/);
    if (first >= 0) html = `${html.slice(0, first)}${importMap}\n  ${html.slice(first)}`;
    html = sealCsp(html, page);
    fs.writeFileSync(file, html);
    console.log(`post-build: ${page}: integrity and CSP hashes written`);
  }
}

if (import.meta.url === `file://${process.argv[1]}`) main();
