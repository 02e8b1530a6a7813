/**
 * A pay table whose names are attacks: level names, identifiers and column
 * names that carry terminal escapes (OSC title, clear screen, backspaces,
 * a C1 control, a right-to-left override), spreadsheet formulas and
 * Markdown/HTML. Built from the first 300 rows of the invented demo table.
 *
 * @module
 */

const root = new URL("../../", import.meta.url).pathname;

/** Text that would drive a terminal, a spreadsheet or a Markdown viewer. */
export const ATTACK = {
  /** Renames the terminal window or tmux pane (OSC 0, ended by BEL). */
  title: "\x1b]0;pwned\x07Cinder",
  /** Clears the screen (CSI 2 J). */
  clear: "\x1b[2JEast",
  /** Backspaces that overwrite what came before. */
  backspace: "People\b\b\b\b\b\bHR",
  /** CSI as one C1 character (U+009B), then "31m": red on terminals that take C1. */
  c1: "\u009b31mSales",
  /** Right-to-left override: the rest reads backwards. */
  rlo: "\u202eOps",
  /** HTML for a Markdown viewer. */
  script: "<script>alert(1)</script>",
  /** A Markdown link with a hidden target. */
  link: "[x](http://evil)",
  /** Breaks a Markdown table row. */
  pipe: "a|b",
  /** Spreadsheet formulas. */
  hyperlink: '=HYPERLINK("http://x","y")',
  sum: "@SUM(A1)",
  plus: "+1",
  minus: "-2+3",
  /** An image tag with a script in its error handler. */
  img: "<img src=x onerror=alert(1)>",
} as const;

/** Hostile identifiers given to the first rows, in order. */
export const HOSTILE_IDS = [
  ATTACK.hyperlink,
  ATTACK.plus,
  ATTACK.minus,
  ATTACK.sum,
  "\t=1",
  "\r=2",
  "\x1b]0;pwned\x07",
  "\u202eFH1",
  "ab\bX",
  "\u009b2J",
];

const REPLACE: Record<string, Record<string, string>> = {
  job_family: {
    Engineering: ATTACK.script,
    "Field Service": ATTACK.link,
    Finance: ATTACK.pipe,
    Operations: ATTACK.rlo,
    People: ATTACK.backspace,
    Sales: ATTACK.c1,
  },
  site: {
    "Cinder Hill": ATTACK.title,
    Eastgate: ATTACK.clear,
    Harbourside: ATTACK.hyperlink,
    Millbrook: ATTACK.sum,
  },
  education: { Bachelor: ATTACK.plus, Master: ATTACK.minus },
  gender: { Woman: ATTACK.img, "Non-binary": "\x1b[2Jnb" },
};

/** Column names: years_experience carries an escape (conceal), remote an override. */
export const HOSTILE_COLUMNS: Record<string, string> = {
  years_experience: "years\x1b[8m_exp",
  remote: "remote\u202e",
};

/** One CSV field, quoted as RFC 4180 says. */
export function field(text: string): string {
  return /[",\r\n\t]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/**
 * The hostile table as rows of cells (header first), `rows` data rows.
 *
 * @param extra Further columns: name -> cell of data row r.
 */
export async function hostileRows(
  rows = 300,
  extra: Record<string, (r: number, pay: number) => string> = {},
): Promise<string[][]> {
  const lines = (await Deno.readTextFile(`${root}fixtures/demo_company.csv`)).trim().split("\n");
  const header = lines[0].split(",");
  const out: string[][] = [[...header.map((h) => HOSTILE_COLUMNS[h] ?? h), ...Object.keys(extra)]];
  const payAt = header.indexOf("base_pay_eur");
  for (let r = 0; r < rows; r++) {
    const cells = lines[r + 1].split(",");
    const row = cells.map((cell, c) => {
      if (c === 0 && r < HOSTILE_IDS.length) return HOSTILE_IDS[r];
      return REPLACE[header[c]]?.[cell] ?? cell;
    });
    for (const make of Object.values(extra)) row.push(make(r, Number(cells[payAt])));
    out.push(row);
  }
  return out;
}

/** The hostile table as CSV text. */
export async function hostileCsv(
  rows = 300,
  extra: Record<string, (r: number, pay: number) => string> = {},
): Promise<string> {
  return (await hostileRows(rows, extra)).map((r) => r.map(field).join(",")).join("\n") + "\n";
}

/**
 * Characters that drive a terminal: C0 controls but tab and line feed, DEL,
 * C1 controls and the bidirectional controls (embeddings, overrides,
 * isolates and marks), and the line and paragraph separators.
 */
export const RAW_CONTROL =
  // deno-lint-ignore no-control-regex
  /[\x00-\x08\x0b-\x1f\x7f-\x9f\u061c\u200e\u200f\u202a-\u202e\u2066-\u2069\u2028\u2029]/;

/** The first raw control character of `text` and what surrounds it, or null. */
export function rawControl(text: string): string | null {
  const at = text.search(RAW_CONTROL);
  if (at < 0) return null;
  return text.slice(Math.max(0, at - 30), at + 30).replace(
    new RegExp(RAW_CONTROL.source, "g"),
    (c) => `<U+${c.charCodeAt(0).toString(16).padStart(4, "0")}>`,
  );
}
