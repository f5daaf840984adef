// What every browser test shares: where the built page, the CLI and the
// demo list are (overridable by environment), and the Chromium flags that
// keep the browser off the network beyond 127.0.0.1.
import path from "node:path";

export const HERE = path.dirname(new URL(import.meta.url).pathname);
export const ROOT = path.resolve(HERE, "../..");
export const DIST = process.env.DIST || path.join(ROOT, "web/dist");
export const CLI = process.env.CLI || path.join(ROOT, "target/fast/rollcall");
export const DEMO = process.env.DEMO || path.join(ROOT, "demo-data/demo-list.tsv");
export const CHROMIUM = process.env.CHROMIUM || "/usr/bin/chromium";
export const HISTORY = path.join(ROOT, "vocab-build/sources/icd10cm-history-FY2016-FY2027.tsv.gz");

export const BROWSER_ARGS = [
  "--headless",
  "--no-sandbox",
  "--disable-gpu",
  "--disable-quic",
  "--no-first-run",
  "--disable-background-networking",
  "--disable-component-update",
  "--disable-sync",
  "--host-resolver-rules=MAP * ~NOTFOUND, EXCLUDE 127.0.0.1",
];
