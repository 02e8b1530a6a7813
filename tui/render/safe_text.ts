/**
 * Text from data (column names, levels, identifiers, file names, messages
 * that quote them) made harmless for where it goes: one function per
 * destination, used by every writer of that destination.
 *
 * - a terminal: {@linkcode terminalText} (and {@linkcode forTerminal} for a
 *   whole document before it is rendered; {@linkcode terminalGuard} on the
 *   streams themselves);
 * - JSON: {@linkcode jsonText};
 * - a CSV cell a spreadsheet may open: {@linkcode csvCell};
 * - Markdown: {@linkcode markdownText} (and {@linkcode forMarkdown}).
 *
 * Control characters are C0 (U+0000-U+001F), DEL, C1 (U+0080-U+009F), the
 * bidirectional controls (U+061C, U+200E, U+200F, U+202A-U+202E,
 * U+2066-U+2069) and the line and paragraph separators (U+2028, U+2029).
 *
 * @module
 */

// deno-lint-ignore no-control-regex
const CONTROL = /[\x00-\x1f\x7f-\x9f\u061c\u200e\u200f\u202a-\u202e\u2066-\u2069\u2028\u2029]/g;
// Beyond what JSON.stringify escapes: DEL, C1, bidirectional controls, separators.
const JSON_RAW = /[\x7f-\x9f\u061c\u200e\u200f\u202a-\u202e\u2066-\u2069\u2028\u2029]/g;
// The only escape sequences paygrove itself writes to a terminal: SGR styles.
// deno-lint-ignore no-control-regex
const OWN_STYLE = /\x1b\[[0-9;]*m/y;

const SHORT: Record<string, string> = { "\t": "\\t", "\n": "\\n", "\r": "\\r" };

/** One control character as it is shown: `\n`, `\x1b`, `\u202e`. */
function visible(c: string): string {
  const code = c.charCodeAt(0);
  return SHORT[c] ??
    (code < 0x20 ? `\\x${code.toString(16).padStart(2, "0")}` : unicodeEscape(c));
}

function unicodeEscape(c: string): string {
  return `\\u${c.charCodeAt(0).toString(16).padStart(4, "0")}`;
}

/**
 * Data text for a terminal: every control character shown as an escape
 * (`\x1b`, `\u009b`, `\u202e`, `\n`), so that it cannot move the cursor,
 * retitle the window, clear the screen or reverse the line. Text without
 * control characters comes back unchanged.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { terminalText } from "./safe_text.ts";
 * assert(terminalText("\x1b]0;pwned\x07Sales") === "\\x1b]0;pwned\\x07Sales");
 * assert(terminalText("\u202eevil") === "\\u202eevil");
 * assert(terminalText("Field Service") === "Field Service");
 * ```
 */
export function terminalText(text: string): string {
  return text.replace(CONTROL, visible);
}

/**
 * The last check on everything written to a terminal stream, whatever its
 * source: line breaks and tabs stay, and with `styled` so do paygrove's own
 * colour codes (SGR); every other control character is shown as an escape.
 * Data text should already have passed {@linkcode terminalText}; this guard
 * catches what did not.
 *
 * @param styled Whether the stream takes paygrove's colour codes.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { terminalGuard } from "./safe_text.ts";
 * assert(terminalGuard("\x1b[1mpay\x1b[22m\n\x1b[2J", true) === "\x1b[1mpay\x1b[22m\n\\x1b[2J");
 * assert(terminalGuard("\x1b[1mpay", false) === "\\x1b[1mpay");
 * ```
 */
export function terminalGuard(text: string, styled: boolean): string {
  return text.replace(CONTROL, (c, at: number) => {
    if (c === "\n" || c === "\t") return c;
    if (styled && c === "\x1b") {
      OWN_STYLE.lastIndex = at;
      if (OWN_STYLE.test(text)) return c;
    }
    return visible(c);
  });
}

/**
 * A document (answer, report, model, schema) with {@linkcode terminalText}
 * applied to every string in it, keys included, for a renderer to draw
 * from: whatever the renderer quotes is then safe, and widths are measured
 * on what is shown. Parts without control characters are shared, not
 * copied; typed arrays and class instances are passed through as they are.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { forTerminal } from "./safe_text.ts";
 * const doc = { levels: ["G1", "\x1b[2J"], shares: { "\x07": 0.5 }, rows: 3 };
 * assert.deepEqual(forTerminal(doc), { levels: ["G1", "\\x1b[2J"], shares: { "\\x07": 0.5 }, rows: 3 });
 * const safe = { levels: ["G1"] };
 * assert(forTerminal(safe) === safe);
 * ```
 */
export function forTerminal<T>(doc: T): T {
  return mapStrings(doc, terminalText);
}

/**
 * JSON.stringify replacer: NaN and infinities, which JSON lacks, become null.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { jsonNumbers } from "./safe_text.ts";
 * assert(JSON.stringify([NaN, 1], jsonNumbers) === "[null,1]");
 * ```
 */
export function jsonNumbers(_key: string, value: unknown): unknown {
  return typeof value === "number" && !Number.isFinite(value) ? null : value;
}

/**
 * A JSON document as text: NaN and infinities as null, two-space indent,
 * and the characters `JSON.stringify` leaves raw (DEL, C1, bidirectional
 * controls, U+2028/9) written as `\u` escapes, so that printing the JSON
 * cannot drive a terminal while reading it gives back the exact text.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { jsonText } from "./safe_text.ts";
 * const text = jsonText({ level: "\u009b31m\u202eX", pay: NaN });
 * assert(text === '{\n  "level": "\\u009b31m\\u202eX",\n  "pay": null\n}');
 * assert(JSON.parse(text).level === "\u009b31m\u202eX");
 * ```
 */
export function jsonText(doc: unknown): string {
  return JSON.stringify(doc, jsonNumbers, 2).replace(JSON_RAW, unicodeEscape);
}

// A number as spreadsheets and paygrove write it: optional minus, digits
// with . or , marks, optional exponent. "+1" is not one (it is a formula).
const NUMBER = /^-?(?:\d[\d.,]*|[.,]\d[\d.,]*)(?:[eE][+-]?\d+)?$/;
// What a spreadsheet takes for the start of a formula (OWASP, "CSV Injection").
const FORMULA_START = /^[=+\-@\t\r]/;

/**
 * One CSV field (RFC 4180) that a spreadsheet will not run: text starting
 * with `=`, `+`, `-`, `@`, a tab or a carriage return gets a leading
 * apostrophe and is quoted, as the common guidance on CSV injection says
 * (OWASP, "CSV Injection"); a number (`-3`, `-0.03`, `1e-7`) is never
 * touched. Control characters other than tab and line feed are shown as
 * escapes (a carriage return too), since a CSV is printed as often as it
 * is opened.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { csvCell } from "./safe_text.ts";
 * assert(csvCell('=HYPERLINK("http://x","y")') === `"'=HYPERLINK(""http://x"",""y"")"`);
 * assert(csvCell("+1") === `"'+1"` && csvCell("-2+3") === `"'-2+3"`);
 * assert(csvCell("-0.03") === "-0.03" && csvCell("-3") === "-3");
 * assert(csvCell("Field Service, north") === '"Field Service, north"');
 * assert(csvCell("a\x1b[2J") === "a\\x1b[2J");
 * ```
 */
export function csvCell(text: string): string {
  const shown = text.replace(CONTROL, (c) => (c === "\n" || c === "\t" ? c : visible(c)));
  if (FORMULA_START.test(shown) && !NUMBER.test(shown)) {
    return `"'${shown.replace(/"/g, '""')}"`;
  }
  return /[",\r\n]/.test(shown) ? `"${shown.replace(/"/g, '""')}"` : shown;
}

// Markdown that could start markup: emphasis, code, links and images,
// table cells, HTML (as entities), and a backslash itself. An underscore
// between letters or digits cannot open or close emphasis (CommonMark's
// flanking rules), so snake_case names stay as they are.
const MARKDOWN_SPECIAL = /[\\`*[\]|~]|(?<![\p{L}\p{N}])_|_(?![\p{L}\p{N}])/gu;
const HTML_SPECIAL: Record<string, string> = { "&": "&amp;", "<": "&lt;", ">": "&gt;" };

/**
 * Data text for a Markdown document, shown as typed and never as markup:
 * control characters as escapes (see {@linkcode terminalText}), `& < >` as
 * HTML entities, and `\ ` * [ ] | ~`, `_` but between letters or digits,
 * and a leading `#`, `+`, `-`, `=` backslash-escaped, so no HTML, link, image, emphasis, heading or list
 * comes from it and a `|` does not split a table cell. A bare URL stays
 * text, though some viewers link it (showing where it goes).
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { markdownText } from "./safe_text.ts";
 * assert(markdownText("<script>") === "&lt;script&gt;");
 * assert(markdownText("[x](http://evil)") === "\\[x\\](http://evil)");
 * assert(markdownText("a|b") === "a\\|b" && markdownText("# x") === "\\# x");
 * assert(markdownText("base_pay _x_") === "base_pay \\_x\\_");
 * ```
 */
export function markdownText(text: string): string {
  return terminalText(text)
    .replace(MARKDOWN_SPECIAL, (c) => `\\${c}`)
    .replace(/[&<>]/g, (c) => HTML_SPECIAL[c])
    .replace(/^[#+\-=]/, (c) => `\\${c}`);
}

/**
 * A document with {@linkcode markdownText} applied to every string in it,
 * keys included, for a Markdown writer to quote from. Only for text that
 * goes into Markdown: the escapes read as the same characters there.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { forMarkdown } from "./safe_text.ts";
 * assert.deepEqual(forMarkdown({ group: "a|b", rows: 4 }), { group: "a\\|b", rows: 4 });
 * ```
 */
export function forMarkdown<T>(doc: T): T {
  return mapStrings(doc, markdownText);
}

// Copy-on-write walk over plain objects and arrays.
function mapStrings<T>(value: T, map: (text: string) => string): T {
  if (typeof value === "string") return map(value) as T;
  if (value === null || typeof value !== "object") return value;
  if (Array.isArray(value)) {
    let out: unknown[] | null = null;
    for (let i = 0; i < value.length; i++) {
      const mapped = mapStrings(value[i], map);
      if (mapped !== value[i] && out === null) out = value.slice(0, i);
      if (out !== null) out.push(mapped);
    }
    return (out ?? value) as T;
  }
  const proto = Object.getPrototypeOf(value);
  if (proto !== Object.prototype && proto !== null) return value;
  let changed = false;
  const entries = Object.entries(value as Record<string, unknown>).map(([k, v]) => {
    const key = map(k);
    const mapped = mapStrings(v, map);
    if (key !== k || mapped !== v) changed = true;
    return [key, mapped] as const;
  });
  return (changed ? Object.fromEntries(entries) : value) as T;
}

// A run of this many characters without a space or punctuation that ends a
// name in a message is no name a person reads.
const LONG_RUN = /[^\s:;,"]{121,}/g;

/**
 * Text for one line of a message, with every run of more than 120
 * characters without a space cut to its start and end and its length:
 * error messages quote column names and cells from the data, and a header
 * of 400,000 characters is to be named, not printed.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { clipLongRuns } from "./safe_text.ts";
 * const clipped = clipLongRuns(`column ${"A".repeat(500)}: not a number`);
 * assert(clipped === `column ${"A".repeat(60)}...${"A".repeat(20)} (500 characters): not a number`);
 * assert(clipLongRuns("column level: 3 levels") === "column level: 3 levels");
 * ```
 */
export function clipLongRuns(text: string): string {
  return text.replace(
    LONG_RUN,
    (run) => `${run.slice(0, 60)}...${run.slice(-20)} (${run.length} characters)`,
  );
}
