// The kinds of finding in a sentence or two each, for the page's glossary;
// each finding links to its kind here. The names are the report's stable
// kind names (rollcall::Kind); the rules behind them are in the README.

export const KINDS = [
  ["normalized", "Written differently from the official form (case, dots, spaces, a letter O for a zero) but clearly this code. The fix only changes how it is written."],
  ["malformed", "Cannot be a code of this system: wrong length, characters or shape."],
  ["unknown", "Shaped like a code of this system, but in no release the index covers."],
  ["retired", "A code that was in use, but only before your day or study period. Its successors, when the release names them, are suggested."],
  ["not-yet-valid", "A code that comes into use only after your day or study period."],
  ["header", "A heading with codes under it: not a code to record. With “billable codes required” it is an error; otherwise it stands for the codes under it."],
  ["partial-period", "In use for part of your study period only; the dates are in the message."],
  ["duplicate", "The same code on more than one line."],
  ["redundant", "Already covered by a heading or a pattern elsewhere in the list."],
  ["roll-up", "Every code under a heading is in the list: the heading alone would say the same in one line."],
  ["sibling-gap", "Most, but not all, codes under a heading are in the list: the missing ones may have been forgotten."],
  ["pattern", "A pattern or range (such as E11.* or E08-E13), with the codes it stands for in your period."],
  ["beyond-coverage", "Your period runs past the last day the index knows this vocabulary; codes are judged up to that day, since no one can know yet what a later release adds or retires."],
  ["two-systems", "The code is also a code of another system, written the same way; it was checked in your list's system. If you meant the other, check it with that system."],
  ["pattern-empty", "A pattern or range that stands for no code in your period."],
  ["other-system", "Not a code of the system checked, but shaped like a code of another one (an ICD-9-CM code in an ICD-10-CM list)."],
  ["shape-only", "Checked by its shape and check digit only: rollcall holds no content for this system, so it cannot tell whether the code exists."],
  ["ambiguous", "Could be several codes of the system (a 10-digit NDC without hyphens)."],
  ["label-mismatch", "The label written beside the code contradicts the code's official description (systolic for diastolic, left for right, type 1 for type 2) or fits another code clearly better: one of the two may be wrong."],
  ["label-unrecognised", "rollcall does not understand the label written beside the code (no code fits it well), so it cannot say whether the label fits; worth a look, nothing to fix."],
  ["release-status", "In the release, but the release qualifies its use (for example, a term to use no longer, with terms to consider instead)."],
];

const known = new Set(KINDS.map(([k]) => k));

/** The glossary anchor id of a kind. */
export function kindId(kind) {
  return `kind-${kind}`;
}

/** Whether the glossary explains this kind. */
export function explains(kind) {
  return known.has(kind);
}

/** Fill the glossary list (a <dl>) with every kind; built from text nodes. */
export function renderGlossary(dl) {
  dl.replaceChildren();
  for (const [kind, words] of KINDS) {
    const dt = document.createElement("dt");
    dt.id = kindId(kind);
    dt.tabIndex = -1;
    const name = document.createElement("code");
    name.textContent = kind;
    dt.append(name);
    const dd = document.createElement("dd");
    dd.textContent = words;
    dl.append(dt, dd);
  }
}

/**
 * Show a kind's entry: open the glossary, scroll to it and move focus there,
 * without touching the address (the list lives in its fragment).
 */
export function showKind(kind) {
  const details = document.getElementById("glossary");
  if (details && "open" in details) details.open = true;
  const dt = document.getElementById(kindId(kind));
  if (!dt) return;
  dt.scrollIntoView({ block: "center" });
  dt.focus();
}
