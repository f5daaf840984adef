// Prints the page's figures (not asserted): Wasm and index transfer sizes,
// the bytes the server sends until the page is "ready", time from navigation
// to "ready", and check times for 1,000, 10,000 and 100,000 lines, through
// the page's button and through the module API (`open`, `check`); the
// single-file page's size and time to ready from file://. Needs a built
// web/dist (web/build.sh) and web/dist-single. With FIGURES_JSON=FILE it
// also writes the figures the README's targets name, as JSON, to FILE.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import zlib from "node:zlib";
import { chromium } from "playwright-core";
import { serve } from "./serve.mjs";

import { ROOT, DIST, DEMO, HISTORY, CHROMIUM, BROWSER_ARGS } from "./env.mjs";
const RUNS = Number(process.env.RUNS || 5);

const kb = (n) => `${(n / 1024).toFixed(1)} KiB`;
const median = (xs) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];
const gz = (buf) => zlib.gzipSync(buf, { level: 9 }).length;
const figures = {};

function sizes() {
  const wasm = fs.readFileSync(path.join(DIST, "rollcall-web_bg.wasm"));
  const index = fs.readFileSync(path.join(DIST, "icd10cm.rcx"));
  let js = 0;
  let jsGz = 0;
  for (const f of fs.readdirSync(DIST)) {
    if (/\.(js|css|html)$/.test(f)) {
      const b = fs.readFileSync(path.join(DIST, f));
      js += b.length;
      jsGz += gz(b);
    }
  }
  const book = fs.readFileSync(path.join(DIST, "rollcall-workbook_bg.wasm"));
  figures.wasm_gzip_bytes = gz(wasm);
  console.log(`wasm                 ${kb(wasm.length)} raw, ${kb(gz(wasm))} gzip   (target <= 250,000 bytes gzip)`);
  console.log(`workbook reader wasm ${kb(book.length)} raw, ${kb(gz(book))} gzip   (fetched with the first workbook)`);
  console.log(`index                ${kb(index.length)} raw, ${kb(gz(index))} gzip`);
  console.log(`html+js+css          ${kb(js)} raw, ${kb(jsGz)} gzip`);
}

// A list as a large study might send: the demo list, then distinct real codes
// of the release history (every k-th row), each with its description.
let historyRows = null;
function listOf(n) {
  const demo = fs.readFileSync(DEMO, "utf8").split("\n").filter((l) => l.trim() && !l.startsWith("#"));
  if (!historyRows) {
    historyRows = zlib.gunzipSync(fs.readFileSync(HISTORY)).toString("utf8").split("\n").slice(1).filter(Boolean)
      .map((l) => { const [code, , , desc] = l.split("\t"); return `${code}\t${desc || ""}`; });
  }
  const out = demo.slice(0, n);
  const step = Math.max(1, Math.floor(historyRows.length / n));
  for (let i = 0; out.length < n; i = (i + step) % historyRows.length) out.push(historyRows[i]);
  return out.join("\n");
}

// The bytes the server sends, as it sends them (no compression: each
// file whole), counted from `reset()`.
function byteCounter() {
  let sent = 0;
  const files = [];
  return {
    onSent(rel, n) {
      sent += n;
      files.push(`${rel.slice(1) || "index.html"} ${n.toLocaleString("en-US")}`);
    },
    reset() {
      sent = 0;
      files.length = 0;
    },
    get sent() {
      return sent;
    },
    files,
  };
}

async function main() {
  sizes();
  const counter = byteCounter();
  const server = await serve(DIST, 0, (rel, n) => counter.onSent(rel, n));
  const origin = `http://127.0.0.1:${server.address().port}/`;
  const profile = fs.mkdtempSync(path.join(os.tmpdir(), "rollcall-fig-"));
  const ctx = await chromium.launchPersistentContext(profile, {
    executablePath: CHROMIUM,
    headless: true,
    args: BROWSER_ARGS,
  });
  try {
    const ready = [];
    const sent = [];
    let page;
    for (let i = 0; i < RUNS; i++) {
      if (page) await page.close();
      page = await ctx.newPage();
      counter.reset();
      await page.goto(origin);
      await page.waitForFunction(() => document.body.dataset.state === "ready", null, { timeout: 30_000 });
      sent.push(counter.sent);
      ready.push(await page.evaluate(() => performance.getEntriesByName("rollcall-ready")[0].startTime));
    }
    // The cache is bypassed (no-cache answers are fetched again), so every run
    // sends the same files; the last run's list is printed.
    figures.bytes_until_ready = Math.max(...sent);
    figures.ready_ms = median(ready);
    console.log(`bytes until ready    ${figures.bytes_until_ready.toLocaleString("en-US")} sent by a server that does not compress (target <= 1,000,000): ${counter.files.join(", ")}`);
    console.log(`navigation -> ready  ${median(ready).toFixed(0)} ms median of ${RUNS} (target <= 400 ms; runs: ${ready.map((x) => x.toFixed(0)).join(", ")})`);
    // The single-file page (web/build-single.sh), opened from file://.
    const single = process.env.SINGLE || path.join(ROOT, "web/dist-single/rollcall.html");
    if (fs.existsSync(single)) {
      const bytes = fs.readFileSync(single);
      const fileReady = [];
      for (let i = 0; i < RUNS; i++) {
        const p = await ctx.newPage();
        await p.goto(`file://${single}`);
        await p.waitForFunction(() => document.body.dataset.state === "ready", null, { timeout: 30_000 });
        fileReady.push(await p.evaluate(() => performance.getEntriesByName("rollcall-ready")[0].startTime));
        await p.close();
      }
      console.log(`single-file page     ${bytes.length.toLocaleString("en-US")} bytes (${kb(bytes.length)}; ${kb(gz(bytes))} gzip); from file:// to ready ${median(fileReady).toFixed(0)} ms median of ${RUNS}`);
    } else {
      console.log("single-file page     not built (web/build-single.sh)");
    }
    for (const n of [1_000, 10_000, 100_000]) {
      await page.evaluate((t) => { document.getElementById("list").value = t; }, listOf(n));
      const worker = [];
      const round = [];
      for (let i = 0; i < RUNS; i++) {
        const before = await page.evaluate(() => Number(document.body.dataset.checked || 0));
        const t0 = await page.evaluate(() => performance.now());
        await page.click("#check-now");
        await page.waitForFunction((k) => Number(document.body.dataset.checked || 0) > k && document.body.dataset.checking === "false", before, { timeout: 120_000 });
        const [t1, ms] = await page.evaluate(() => [performance.now(), Number(document.body.dataset.checkMs)]);
        worker.push(ms);
        round.push(t1 - t0);
      }
      console.log(`check ${n.toLocaleString("en-US").padStart(7)} lines  ${median(worker).toFixed(1)} ms in the worker, ${median(round).toFixed(0)} ms until shown on the page`);
    }
    // The documented module API: `open` an index, then `check` a list; the
    // time from the call until the report is in the caller's hands.
    await page.evaluate(async () => {
      const { open } = await import("./rollcall.js");
      globalThis.apiChecker = await open("icd10cm.rcx", { manifest: "index-manifest.json" });
    });
    for (const n of [10_000, 100_000]) {
      const text = listOf(n);
      const times = [];
      const inWorker = [];
      for (let i = 0; i < RUNS; i++) {
        const [ms, worker, entries] = await page.evaluate(async (t) => {
          const t0 = performance.now();
          const r = await globalThis.apiChecker.checkWithCoverage(t);
          return [performance.now() - t0, r.checkMs, r.report.entries.length];
        }, text);
        if (entries !== n) throw new Error(`the API's report has ${entries} entries for ${n} lines`);
        times.push(ms);
        inWorker.push(worker);
      }
      figures[`api_check_${n}_ms`] = median(times);
      const target = n === 10_000 ? 30 : 300;
      console.log(`API check ${n.toLocaleString("en-US").padStart(7)} lines  ${median(times).toFixed(1)} ms from the call to the report (${median(inWorker).toFixed(1)} ms of it checking in the worker; target <= ${target} ms)`);
    }
    if (process.env.FIGURES_JSON) fs.writeFileSync(process.env.FIGURES_JSON, JSON.stringify(figures, null, 1));
  } finally {
    await ctx.close();
    server.close();
    fs.rmSync(profile, { recursive: true, force: true });
  }
}

main().catch((e) => {
  console.error(`figures: ${e.message}`);
  process.exit(1);
});
