// Files as the page takes them. Text of any form (plain lines, CSV, TSV,
// markdown, prose, SQL or R, JSON and FHIR resources) goes into the list as it
// is: the checker's reader in the core finds the codes, as the command line
// does, so line numbers stay those of the file. Spreadsheet workbooks are
// read by the checker from their bytes.

/** Whether a file is a spreadsheet workbook (zip or OLE2 container, or its name says so). */
export function isWorkbook(name, bytes) {
  const lower = String(name || "").toLowerCase();
  const zip = bytes.length >= 4 && bytes[0] === 0x50 && bytes[1] === 0x4b && bytes[2] === 3 && bytes[3] === 4;
  const ole = bytes.length >= 8 && bytes[0] === 0xd0 && bytes[1] === 0xcf && bytes[2] === 0x11 && bytes[3] === 0xe0;
  return zip || ole || /\.(xlsx|xlsm|xls|ods)$/.test(lower);
}

/**
 * The text of a dropped or opened file: UTF-8 (a byte-order mark dropped),
 * or UTF-16 with its mark. Throws an Error with a readable message.
 */
export function fileText(name, bytes) {
  let text;
  if (bytes[0] === 0xff && bytes[1] === 0xfe) text = new TextDecoder("utf-16le").decode(bytes.subarray(2));
  else if (bytes[0] === 0xfe && bytes[1] === 0xff) text = new TextDecoder("utf-16be").decode(bytes.subarray(2));
  else {
    try {
      text = new TextDecoder("utf-8", { fatal: true }).decode(bytes);
    } catch {
      throw new Error(`“${name}” is not UTF-8 text; save it as UTF-8 (in a spreadsheet: CSV UTF-8) and try again`);
    }
  }
  text = text.replace(/^\uFEFF/, "");
  if (text.includes("\u0000")) throw new Error(`“${name}” is not a text file`);
  return text;
}
