// Types of the report, card and comparison: the JSON the CLI writes
// (`--format json`), the Wasm binding returns (web/src/js.rs includes this
// file as its TypeScript section) and the JavaScript API resolves to
// (rollcall.d.ts re-exports it). Written once, here.

/** What an index says about itself, plus the file's size and SHA-256 of its content. */
export interface IndexInfo {
  vocabulary: string;
  title: string;
  release: string;
  coverage_from: string;
  coverage_to: string;
  sources: { file: string; sha256: string; role: string }[];
  /** Credit the release's licence asks to show (HPO); empty when none. */
  notice: string;
  byte_length: number;
  sha256: string;
  /** The day checked when no day or period is given: today when the index
   * covers it, else the nearest day it covers (ICD-9-CM: 2015-09-30). Set by
   * the worker; absent from a manifest. */
  default_day?: string;
}

/** index-manifest.json: an IndexInfo written at build time, with the index's file name. */
export interface IndexManifest extends IndexInfo {
  file?: string;
}

/** A system whose index the page serves beside it (the binding's
 * `bundledSystems()`, from the core's policy); every other system is checked
 * by shape and check digit only. */
export interface BundledSystem {
  /** `icd10cm`, `icd10pcs`, `icd9cm`, `hpo`. */
  name: string;
  title: string;
  /** The manifest beside the page that describes its index. */
  manifest: string;
  /** The bundled index kept at hand beside it (ICD-9-CM beside ICD-10-CM and back), or null. */
  companion: string | null;
  /** The system a list is checked in when none is named (the page's first index). */
  default: boolean;
}

/** Options of one check. Give `on`, or `from` and `to`, or neither (the index's default day: today, UTC, when it covers it). Dates are YYYY-MM-DD. */
export interface CheckOptionsInput {
  on?: string | null;
  from?: string | null;
  to?: string | null;
  /** Header (non-billable) codes are errors. */
  billable?: boolean;
  /**
   * A system checked by shape only (hpo, loinc, snomed, ndc, hcpcs, cpt, rxnorm)
   * for the rows with no system cell, as the CLI's `--system NAME`.
   */
  system?: string;
  /** How to read the list: "auto" (guess; default), "lines", "table", "text", "json", "workbook" (the CLI's `--read`). */
  reading?: string;
}

/** How a list was read (the report's `reading`; absent for plain lines or a table read without being told to). */
export interface ReadFacts {
  as: "lines" | "table" | "text" | "json" | "workbook";
  /** plain lines, csv, tsv, markdown, prose, sql, r, code literals, json, fhir valueset, fhir bundle, workbook... */
  form: string;
  forced: boolean;
  codes: number;
  lines_with_codes: number;
  lines: number;
  sheets?: { name: string; rows: number; codes: number }[];
  notes?: string[];
}

/** A code the reader found in the text, with UTF-16 offsets (as a textarea's selection counts). */
export interface DraftToken {
  line: number;
  /** The entry's column in the report, when the code sits inside a longer line. */
  column: number | null;
  start: number;
  end: number;
  code: string;
}

export type Severity = "error" | "warning" | "info";

export interface Suggestion {
  code: string;
  description: string;
  reason: string;
}

export interface Finding {
  kind: string;
  severity: Severity;
  message: string;
  suggestions: Suggestion[];
}

export interface Entry {
  line: number;
  input: string;
  code: string | null;
  /** The system the entry was checked in (icd10cm, icd10pcs, loinc, ...). */
  system: string | null;
  label: string | null;
  description: string | null;
  /** 1-based column of the code, when it was found inside a longer line of a draft. */
  column?: number;
  /** Workbook sheet and row the entry was read from. */
  sheet?: string;
  row?: number;
  status: string;
  findings: Finding[];
}

export interface ListFinding {
  kind: string;
  severity: Severity;
  lines: number[];
  codes: string[];
  message: string;
  suggestions: Suggestion[];
  /** `beyond-coverage` only: the last day the index knows. */
  coverage_to?: string;
}

/** The check report: the same schema as the CLI's `--format json`. */
export interface Report {
  vocabulary: string;
  /** How the list was read; absent for plain lines or a table read without being told to. */
  reading?: ReadFacts;
  index: {
    release: string;
    coverage_from: string;
    coverage_to: string;
    sources: { file: string; sha256: string; role: string }[];
    /** The release's licence credit, when it asks for one (HPO, LOINC). */
    notice?: string;
  };
  /** `single_release` only for a one-release vocabulary (HPO): `on` is then its release day. */
  options: { on: string | null; from: string; to: string; billable: boolean; single_release?: boolean };
  entries: Entry[];
  list_findings: ListFinding[];
  summary: {
    lines: number;
    entries: number;
    errors: number;
    warnings: number;
    infos: number;
    /** Entries per system. */
    systems: Record<string, number>;
    /** Only for a list with a system column: each system's rows and what they were checked against. */
    by_system?: SystemPart[];
  };
}

export interface SystemPart {
  system: string;
  title: string;
  checked: "index" | "shape" | "not-loaded";
  release: string | null;
  /** That index's licence credit, when it has one (HPO). */
  notice?: string;
  entries: number;
  errors: number;
  warnings: number;
  infos: number;
}

export interface Span {
  kind: "billable" | "header";
  from: string;
  to: string;
}

export interface CategoryCoverage {
  category: string;
  description: string;
  included: number;
  total: number;
}

/** A change to the list; line numbers are those of the list as it is. */
export type Edit =
  | { op: "replace"; line: number; code: string; column?: number }
  | { op: "remove"; line: number }
  | { op: "add"; after: number; code: string; label?: string | null };

/** A code and its description. */
export interface Named { code: string; description: string }

/** A run of billable codes only one list reaches (see the README's compare rules). */
export interface Difference {
  side: "a" | "b";
  code: string;
  description: string;
  all_of: boolean;
  codes: Named[];
  within: Named | null;
  within_total: number;
  within_only: number;
  category: string;
  chapter: string;
  nearest: { code: string; description: string; relation: "parent" | "child" | "sibling" | "same-category" } | null;
}

/** Two lists compared: the same schema as the CLI's `compare --format json`. */
export interface Comparison {
  vocabulary: string;
  index: Report["index"];
  options: Report["options"];
  a: { name: string; summary: Report["summary"]; reaches: number; report: Report };
  b: { name: string; summary: Report["summary"]; reaches: number; report: Report };
  agreement: { both: number; only_a: number; only_b: number; union: number; jaccard: number; a_in_b: number; b_in_a: number };
  chapters: { chapter: string; title: string; both: number; only_a: number; only_b: number }[];
  differences: Difference[];
  equivalents: { a_lines: number[]; a_entries: string[]; b_lines: number[]; b_entries: string[]; codes: number }[];
}

/** Spans per code; `null` for a code the index does not know. */
export type Timelines = Record<string, Span[] | null>;

/** A code on a day, with its count of billable codes under it (HPO: terms in use). */
export interface CardChild {
  code: string;
  description: string;
  status: "billable" | "header" | "not-in-use" | "in-use" | "obsolete";
  billable_under: number;
}

/** One span of a card's timeline, and what began it. */
export interface CardSegment {
  from: string;
  to: string;
  state: "billable" | "header" | "absent" | "in-use" | "obsolete";
  reason: "first-release" | "in-release" | "not-yet-added" | "added" | "subdivided" | "merged" | "retired" | "obsolete";
  /** The children that took over, or a retired code's successors. */
  codes: string[];
}

/** A tabular-list note that holds for the code. */
export interface CardNote {
  kind: "includes" | "inclusion-term" | "excludes1" | "excludes2" | "code-first" | "use-additional-code" | "code-also" | "note" | "seventh-character";
  text: string;
  /** Codes of the index the note names (dotted; both ends of a range). */
  codes: string[];
  level: "code" | "section" | "chapter";
  /** The code, section range or chapter number that states it. */
  at: string;
}

/** Everything known about one code: a card of the CLI's `show --format json`. */
export interface Card {
  code: string;
  system: string;
  description: string;
  status: string;
  /** For text that is no code: what a check says, with its suggestions. */
  problem?: { message: string; suggestions: Suggestion[] };
  timeline: CardSegment[];
  chapter: { code: string; title: string } | null;
  section: { code: string; title: string } | null;
  /** From the category down to the parent, in force on the day. */
  ancestors: { code: string; description: string }[];
  parents: { code: string; description: string }[];
  children: CardChild[];
  siblings: CardChild[];
  notes: CardNote[];
  /** "loaded"; "not-loaded": the notes file is not loaded yet (see
   * Checker.loadNotes), so `notes` is empty for that reason alone; "none":
   * no notes are kept for this vocabulary. */
  notes_status: "loaded" | "not-loaded" | "none";
  seventh_character?: { at: string; extensions: [string, string][] };
  successors: { code: string; description: string; effective: string | null }[];
  predecessors: { code: string; description: string; effective: string | null }[];
  consider?: { code: string; description: string }[];
  alternate_ids?: string[];
  /** HPO: the term's synonyms, as released and in its order. */
  synonyms?: string[];
  mappings: {
    mapping: string;
    title: string;
    role: "source" | "target";
    code: string;
    system: string;
    description: string;
    flags: { approximate: boolean; no_map: boolean; combination: boolean; scenario: number; choice_list: number };
  }[];
}

