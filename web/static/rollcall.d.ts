// Types of rollcall.js, the JavaScript API of the checker. The report,
// card and comparison types are in report.d.ts, shared with the Wasm
// binding (web/src/lib.rs) and the CLI's `--format json`.

export * from "./report";
import type {
  Card,
  CategoryCoverage,
  CheckOptionsInput,
  DraftToken,
  Edit,
  Entry,
  IndexInfo,
  IndexManifest,
  ReadFacts,
  Report,
  Timelines,
} from "./report";

/** One row of a list: a line as written, `{code, label}`, or `[code, label]`. */
export type Row = string | { code: string; label?: string | null } | [string, (string | null)?];

/** A list: text (one entry per line) or rows (row i is line i + 1 of the report). */
export type List = string | Row[];

/** Where an index comes from: a URL (relative to the page) or its bytes. */
export type IndexSource = string | URL | ArrayBuffer | ArrayBufferView | Blob | Response;

export interface OpenOptions {
  /** The manifest, or its URL: the index must match its SHA-256 and release. */
  manifest?: IndexManifest | string | URL | null;
  /** Called while a URL downloads. `total` is 0 when unknown. */
  onProgress?: (received: number, total: number) => void;
  /** A Worker running worker.js; default: worker.js beside rollcall.js. */
  worker?: Worker;
  /** The Wasm bytes, for a worker that cannot fetch rollcall-web_bg.wasm itself. */
  wasm?: ArrayBuffer | ArrayBufferView;
  /** The notes file, for a worker that cannot fetch it by its manifest
   * (the single-file page): its bytes on demand, and its manifest. */
  notes?: { bytes: () => Promise<Uint8Array>; manifest: object };
}

export interface CheckResult {
  report: Report;
  coverage: CategoryCoverage[];
  /** Time of the check itself in the worker, ms. */
  checkMs: number;
  /** Check plus coverage in the worker, ms. */
  totalMs: number;
  /** The systems whose indexes the worker has loaded (this one's first). */
  loaded: string[];
}

/** A page of a long list's entries, as they are judged (or a restart: the pages before it are void). */
export type CheckPage = { entries: Entry[]; done: number; lines: number; restart?: undefined } | { restart: true };

/** Sees each page of entries as it comes; `all` holds every entry so far. */
export type OnPage = (page: CheckPage, all: Entry[]) => void;

/** A loaded, verified index in its own worker. */
export class Checker {
  readonly info: IndexInfo;
  /** Check a list; the report in the CLI's JSON schema. */
  check(list: List, options?: CheckOptionsInput): Promise<Report>;
  /** The report with the coverage and timings; `onPage` sees a long list's entries as they are judged. */
  checkWithCoverage(list: List, options?: CheckOptionsInput, onPage?: OnPage): Promise<CheckResult>;
  /** Check a file as the CLI reads it: a workbook (.xlsx, .xls, .ods; each entry names its sheet and row)
   * or text in any form. The worker loads the workbook reader (a Wasm module of its own) with the first workbook. */
  checkFile(file: Blob | ArrayBuffer | Uint8Array, options?: CheckOptionsInput): Promise<CheckResult>;
  /** How the core reads the list, and where each code sits in the text. */
  read(list: List, reading?: string): Promise<{ reading: ReadFacts; tokens: DraftToken[] }>;
  /** The list with edits applied, every other character kept (a code in a draft is replaced where it stands). */
  edit(text: string, edits: Edit[], reading?: string): Promise<string>;
  timelines(codes: Iterable<string>): Promise<Timelines>;
  /** The card of a code, node or code start for the options' day or period. */
  card(code: string, options?: CheckOptionsInput): Promise<Card>;
  /** Load the index's notes file (the tabular list's notes on cards) if its
   * system has one; true once loaded, false when it keeps no notes. */
  loadNotes(): Promise<boolean>;
  /** Lower-case hex SHA-256 of the list's text as UTF-8 (rows joined as `listText` joins them). */
  digest(list: List): Promise<string>;
  /** A request by name to the worker (the protocol is described in worker.js). */
  request(type: string, payload?: object, transfer?: Transferable[], onPage?: OnPage): Promise<unknown>;
  /** Stop the worker; later calls reject. */
  close(): void;
}

/** Start a worker, load and verify an index. Rejects with a readable message. */
export function open(source: IndexSource, options?: OpenOptions): Promise<Checker>;

/** One of a site's own indexes: its name in site-indexes.json (its manifest's file name) and that manifest. */
export interface SiteIndex {
  name: string;
  manifest: IndexManifest & { file: string };
}

/** What site-indexes.json beside rollcall.js offers. */
export interface SiteIndexes {
  /** The file's name: site-indexes.json. */
  file: string;
  /** False when the site has no such file (it then has no indexes of its own). */
  found: boolean;
  indexes: SiteIndex[];
  /** Each listed manifest that is missing or wrong (left out of `indexes`), and why. */
  problems: { name: string; message: string }[];
}

/** The site's own indexes, each manifest checked. Rejects with a readable message when site-indexes.json is malformed. */
export function siteIndexes(): Promise<SiteIndexes>;

/** Open one of the site's own indexes by its name in site-indexes.json; verified against its manifest. */
export function openSite(name: string, options?: Pick<OpenOptions, "onProgress">): Promise<Checker>;

/** A manifest object as it is, or fetched from its URL and checked for shape. */
export function readManifest(manifest: IndexManifest | string | URL | null | undefined): Promise<IndexManifest | null>;

/** The text the checker reads for a list (rows joined with newlines, code and label by a tab). */
export function listText(list: List): string;
