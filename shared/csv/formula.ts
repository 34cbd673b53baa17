/**
 * Spreadsheet formula protection for the text cells of the CSV files Fringewalk writes (OWASP, "CSV
 * Injection"): a spreadsheet runs a cell that starts with =, +, -, @, a tab or a carriage return as a
 * formula, so a surveyor's note such as `=HYPERLINK(…)` would run on a reviewer's machine. Such a text
 * is written with a leading apostrophe, which spreadsheets show as text; a text that already starts
 * with apostrophes before one of those characters gets one more, so that reading a file back
 * (`unprotectCell`) gives exactly the text written. Numbers, ids and times are written as they are and
 * never pass through here (a negative field component stays a number).
 */
const FORMULA_START = /^'*[=+\-@\t\r]/;
const PROTECTED = /^'+[=+\-@\t\r]/;

export function protectCell(text: string): string {
  return FORMULA_START.test(text) ? `'${text}` : text;
}

export function unprotectCell(text: string): string {
  return PROTECTED.test(text) ? text.slice(1) : text;
}
