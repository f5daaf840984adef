// The single-file page: one HTML file with the page's script, styles, the
// Wasm, the worker (with the workbook reader), the bundled index and its notes
// file inside, for a shared drive or an e-mail. It works opened from file://
// with no network at all. The Wasm files, the index and the notes are stored
// gzip-compressed in base64 and unpacked with DecompressionStream (the
// workbook reader's in the worker, on first use; the notes when a card is
// first opened); the worker starts from a Blob URL.
// Usage: node web/build-single.mjs [DIST] [OUT]   (after web/build.sh)
import fs from "node:fs";
import path from "node:path";
import zlib from "node:zlib";
import { sealCsp } from "./post-build.mjs";

const HERE = path.dirname(new URL(import.meta.url).pathname);
const DIST = path.resolve(process.argv[2] || path.join(HERE, "dist"));
const OUT = path.resolve(process.argv[3] || path.join(HERE, "dist-single", "rollcall.html"));

// Nothing but what is inside the file; the worker comes from a Blob URL.
const CSP =
  "default-src 'none'; script-src 'wasm-unsafe-eval'; worker-src blob:; style-src; img-src data:; " +
  "connect-src 'none'; object-src 'none'; base-uri 'none'; form-action 'none'";

function die(msg) {
  console.error(`build-single: ${msg}`);
  process.exit(1);
}

const read = (name) => {
  const file = path.join(DIST, name);
  if (!fs.existsSync(file)) die(`${file} is missing; run web/build.sh first`);
  return fs.readFileSync(file);
};

/** Text that may sit inside an inline <script> without ending it. */
function scriptSafe(text) {
  return text.replace(/<\/(script)/gi, "<\\/$1").replace(/<!--/g, "<\\!--");
}

/**
 * The page's ES modules as one script: each module body in a function whose
 * exports land in __modules, imports read from there. Only the plain forms
 * these modules use are known (`import { a, b as c } from "./x.js"` and
 * `export function|const|let|class`); anything else stops the build.
 */
export function bundle(entry, source) {
  const order = [];
  const seen = new Set();
  const importRe = /^import\s*\{([^}]*)\}\s*from\s*"(\.\/[^"]+)";?[ \t]*$/gm;
  const visit = (name) => {
    if (seen.has(name)) return;
    seen.add(name);
    for (const m of source(name).matchAll(importRe)) visit(m[2].slice(2));
    order.push(name);
  };
  visit(entry);
  let out = "const __modules = {};\n";
  for (const name of order) {
    let src = source(name).replace(importRe, (_, names, spec) => {
      const list = names
        .split(",")
        .map((n) => n.trim())
        .filter(Boolean)
        .map((n) => n.replace(/\s+as\s+/, ": "));
      return `const { ${list.join(", ")} } = __modules[${JSON.stringify(spec)}];`;
    });
    if (/^\s*import[\s{*"']/m.test(src) || /\bimport\s*\(/.test(src)) die(`${name}: an import the bundler does not handle`);
    const names = [];
    src = src.replace(/^export\s+(async\s+function|function|const|let|class)\s+([A-Za-z_$][\w$]*)/gm, (_, kind, id) => {
      names.push(id);
      return `${kind} ${id}`;
    });
    if (/^export\b/m.test(src)) die(`${name}: an export the bundler does not handle`);
    out += `__modules[${JSON.stringify(`./${name}`)}] = (() => {\n${src}\nreturn { ${names.join(", ")} };\n})();\n`;
  }
  return out;
}

function embeddedModule() {
  const glue = read("rollcall-web.js").toString("utf8");
  const worker = read("worker.js").toString("utf8");
  const manifest = JSON.parse(read("index-manifest.json").toString("utf8"));
  const index = read(manifest.file || "icd10cm.rcx");
  const wasm = read("rollcall-web_bg.wasm");
  const bookGlue = read("rollcall-workbook.js").toString("utf8");
  const bookWasm = read("rollcall-workbook_bg.wasm");
  // The notes file's manifest: its name is the one the Trunk post-build
  // gives it (the core's System::notes_manifest).
  const notesManifest = JSON.parse(read("manifest-icd10cm-notes.json").toString("utf8"));
  if (notesManifest.index_sha256 !== manifest.sha256) die("the notes file was not written with the bundled index");
  const notes = read(notesManifest.file);
  const gz = (bytes) => zlib.gzipSync(bytes, { level: 9 }).toString("base64");
  const indexGz = gz(index);
  const wasmGz = gz(wasm);
  const bookGz = gz(bookWasm);
  const notesGz = gz(notes);
  const sizes = {
    index: index.length,
    indexGz: indexGz.length,
    wasm: wasm.length,
    wasmGz: wasmGz.length,
    book: bookWasm.length,
    bookGz: bookGz.length,
    notes: notes.length,
    notesGz: notesGz.length,
  };
  // The worker carries the workbook reader (its glue, and its Wasm as gzip
  // in base64), which it unpacks only when a workbook is checked.
  const workerSource = `${glue}\n;\n${bookGlue}\n;\nconst WORKBOOK_WASM_GZ = "${bookGz}";\n${worker}`;
  const code = `// The single-file page's contents: the index, its notes, the Wasm and the worker.
const WORKER_SOURCE = ${JSON.stringify(workerSource)};
const WASM_GZ = "${wasmGz}";
const INDEX_GZ = "${indexGz}";
const MANIFEST = ${JSON.stringify(manifest)};
const NOTES_GZ = "${notesGz}";
const NOTES_MANIFEST = ${JSON.stringify(notesManifest)};
const DEMO = ${JSON.stringify(read("demo-list.tsv").toString("utf8"))};

async function gunzip(base64) {
  const text = atob(base64);
  const bytes = new Uint8Array(text.length);
  for (let i = 0; i < text.length; i++) bytes[i] = text.charCodeAt(i);
  const stream = new Blob([bytes]).stream().pipeThrough(new DecompressionStream("gzip"));
  return new Uint8Array(await new Response(stream).arrayBuffer());
}

export const embedded = {
  manifest: MANIFEST,
  demo: DEMO,
  index: () => gunzip(INDEX_GZ),
  wasm: () => gunzip(WASM_GZ),
  notes: { bytes: () => gunzip(NOTES_GZ), manifest: NOTES_MANIFEST },
  worker: () => new Worker(URL.createObjectURL(new Blob([WORKER_SOURCE], { type: "text/javascript" }))),
};
`;
  return { code, sizes };
}

function main() {
  let html = read("index.html").toString("utf8");
  const { code: embedded, sizes } = embeddedModule();
  const script = scriptSafe(
    bundle("app.js", (name) => (name === "embedded.js" ? embedded : read(name).toString("utf8"))),
  );
  if (/<\/script/i.test(script)) die("the bundled script would end its own <script> element");

  html = html.replace(/<script type="importmap">[\s\S]*?<\/script>\s*/g, "");
  html = html.replace(/<link\b[^>]*\b(?:rel="(?:preload|modulepreload)"|data-trunk)[^>]*>\s*/g, "");
  // The icon as a data: URL (the page's policy allows images from data: only).
  html = html.replace(/<link rel="icon" href="([^"]+)" type="image\/svg\+xml">/, (_, href) =>
    `<link rel="icon" href="data:image/svg+xml;base64,${read(href).toString("base64")}">`,
  );
  let styled = false;
  html = html.replace(/<link\b[^>]*\brel="stylesheet"[^>]*\bhref="([^"]+)"[^>]*>/g, (_, href) => {
    styled = true;
    return `<style>${read(href.replace(/^\.\//, "")).toString("utf8").replace(/<\/style/gi, "<\\/style")}</style>`;
  });
  let scripted = false;
  html = html.replace(/<script\b[^>]*\bsrc="(?:\.\/)?app\.js"[^>]*><\/script>/, () => {
    scripted = true;
    return `<script type="module">${script}</script>`;
  });
  if (!styled || !scripted) die("index.html has no stylesheet link or no app.js script to inline");
  const left = [...html.matchAll(/<(?:script|link|img|iframe)\b[^>]*\b(?:src|href)="(?!#|data:)([^"]+)"/g)].map((m) => m[1]);
  if (left.length) die(`the page still loads files: ${left.join(", ")}`);
  html = html.replace(
    "the index is loaded from this site and checking happens in a background worker.",
    "the index is inside this one file and checking happens in a background worker; it needs no network.",
  );
  html = html.replace(/(<meta http-equiv="Content-Security-Policy" content=")[^"]*(">)/, `$1${CSP}$2`);
  html = sealCsp(html, "the single-file page");
  fs.mkdirSync(path.dirname(OUT), { recursive: true });
  fs.writeFileSync(OUT, html);
  const bytes = Buffer.byteLength(html);
  const gzipped = zlib.gzipSync(html, { level: 9 }).length;
  const kib = (n) => `${(n / 1024).toFixed(0)} KiB`;
  console.log(`build-single: ${OUT}`);
  console.log(`build-single: ${bytes.toLocaleString("en-US")} bytes (${kib(bytes)}; ${kib(gzipped)} gzipped)`);
  console.log(
    `build-single: index ${kib(sizes.index)} raw, ${kib(sizes.indexGz)} as gzip+base64; notes ${kib(sizes.notes)} raw, ${kib(sizes.notesGz)} as gzip+base64; ` +
      `Wasm ${kib(sizes.wasm)} raw, ${kib(sizes.wasmGz)} as gzip+base64; ` +
      `workbook reader Wasm ${kib(sizes.book)} raw, ${kib(sizes.bookGz)} as gzip+base64`,
  );
}

if (import.meta.url === `file://${process.argv[1]}`) main();
