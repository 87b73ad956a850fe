// Text people type (names of accounts, projects, models) travels into page titles, mail
// subjects, PDFs and spreadsheets. Two tricks are refused here, in one place:
// - bidirectional control characters (U+202A..U+202E, U+2066..U+2069, U+200E/F, U+061C) that
//   make "invoice‮fdp.exe" read backwards, and other invisible control characters;
// - spreadsheet formulas: a CSV cell starting with = + - @ tab or CR is run by spreadsheet
//   programs as a formula (common practice: the OWASP "CSV injection" advice).
// Pure module: pages, mails, the report and CSV exports all import it.

// eslint-disable-next-line no-control-regex
const CONTROLS = /[\u0000-\u0008\u000B\u000C\u000E-\u001F\u007F-\u009F\u061C\u200E\u200F\u202A-\u202E\u2066-\u2069]/g;
const BIDI = /[\u061C\u200E\u200F\u202A-\u202E\u2066-\u2069]/;
const BIDI_ALL = new RegExp(BIDI.source, "g");

/** The text without bidirectional control characters (everything else kept). */
export function stripBidi(text: string): string {
  return text.replace(BIDI_ALL, "");
}

/** True when the text holds a bidirectional control character. */
export function hasBidiControls(text: string): boolean {
  return BIDI.test(text);
}

/**
 * The text without bidi controls and other control characters; line breaks and tabs become
 * spaces (a title, subject or table cell is one line).
 */
export function plainText(text: string | null | undefined): string {
  if (text == null) return "";
  return String(text).replace(/[\t\r\n]+/g, " ").replace(CONTROLS, "");
}

const FORMULA_START = /^[=+\-@\t\r]/;
const PLAIN_NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/**
 * A text cell of a CSV file, safe to open in a spreadsheet: text that a spreadsheet would run
 * as a formula (starting with = + - @ tab or CR) gets a leading apostrophe, which spreadsheets
 * show as text and never evaluate. A cell that is exactly a number ("-3.2", "+4e3") is data,
 * not a formula, and stays as it is; numeric values themselves never come through here.
 */
export function formulaSafe(text: string): string {
  if (!FORMULA_START.test(text) || PLAIN_NUMBER.test(text)) return text;
  return `'${text}`;
}
