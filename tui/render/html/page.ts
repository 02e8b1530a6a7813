/**
 * One self-contained HTML page: a report someone without a terminal opens by
 * double-click, prints to PDF, and reads with no network and no script.
 *
 * Everything from the data is escaped here (names and levels come from the
 * table and are untrusted); nothing in the page refers outside it (no `src`,
 * `href` or CSS `url()` but `#` anchors), and a Content-Security-Policy
 * meta forbids any fetch as a second guard, for the mail clients and
 * browsers that honour it.
 *
 * Plain functions build the markup: a report is a handful of sections,
 * tables and figures, and a template library would add a dependency and a
 * second escaping rule to keep in mind for no gain in clarity.
 *
 * @module
 */

/**
 * Escapes text for HTML content and double-quoted attribute values.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { escapeHtml } from "./page.ts";
 * assert.equal(escapeHtml(`<script>"a" & 'b'`), "&lt;script&gt;&quot;a&quot; &amp; &#39;b&#39;");
 * ```
 */
export function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => ESCAPES[c]);
}

const ESCAPES: Record<string, string> = {
  "&": "&amp;",
  "<": "&lt;",
  ">": "&gt;",
  '"': "&quot;",
  "'": "&#39;",
};

/** A table cell: its text as shown, and the figure it shows, carried in `data-value`. */
export interface HtmlCell {
  /** What the reader sees (escaped when written). */
  text: string;
  /** The figure behind the text, unrounded, as the command's JSON has it. */
  value?: number;
  /** Right-aligned (figures). @default {true when value is given} */
  numeric?: boolean;
}

/**
 * A table of figures: a caption, a header row, then rows; every cell with a
 * figure carries it in `data-value` (a test reads them back against the
 * command's JSON), and every text is escaped.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { figureTable } from "./page.ts";
 * const html = figureTable("Bands", ["cell", "min"], [[{ text: "<G1>" }, { text: "€34,342", value: 34342.28 }]]);
 * assert.match(html, /<caption>Bands<\/caption>/);
 * assert.match(html, /<td>&lt;G1&gt;<\/td>/);
 * assert.match(html, /<td class="num" data-value="34342.28">€34,342<\/td>/);
 * ```
 */
export function figureTable(caption: string, head: string[], rows: HtmlCell[][]): string {
  const headRow = head.map((h) => `<th scope="col">${escapeHtml(h)}</th>`).join("");
  const body = rows.map((row) =>
    `<tr>${
      row.map((cell) => {
        const numeric = cell.numeric ?? cell.value !== undefined;
        const attributes = (numeric ? ` class="num"` : "") +
          (cell.value !== undefined ? ` data-value="${cell.value}"` : "");
        return `<td${attributes}>${escapeHtml(cell.text)}</td>`;
      }).join("")
    }</tr>`
  ).join("\n");
  return `<table>\n<caption>${
    escapeHtml(caption)
  }</caption>\n<thead><tr>${headRow}</tr></thead>\n` +
    `<tbody>\n${body}\n</tbody>\n</table>`;
}

/** A section of a report: a heading and its body (markup built by this module's functions). */
export interface HtmlSection {
  /** The heading (escaped when written). */
  title: string;
  /** The section's markup: paragraphs, figures and tables made here. */
  body: string;
}

/** What a report page holds. */
export interface HtmlPage {
  /** The page's title, also its first heading. */
  title: string;
  /** The question the report answers, in the reader's words. */
  question: string;
  /** When it was written (ISO 8601). */
  created: string;
  /** Where the figures come from: the program, the model, the table. */
  provenance: string[];
  /** The cautions shown with every answer. */
  cautions: string[];
  /** The report's sections, in order. */
  sections: HtmlSection[];
}

/**
 * A paragraph of escaped text.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { paragraph } from "./page.ts";
 * assert.equal(paragraph("a < b", "note"), `<p class="note">a &lt; b</p>`);
 * ```
 */
export function paragraph(text: string, kind?: "note" | "warning"): string {
  return `<p${kind === undefined ? "" : ` class="${kind}"`}>${escapeHtml(text)}</p>`;
}

/**
 * The whole page: head with its guards and styles, the title, the question,
 * the date, the cautions first, the sections, the provenance last.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { htmlPage, paragraph } from "./page.ts";
 * const html = htmlPage({
 *   title: "Pay bands by <level>", question: "What ranges?", created: "2026-12-03T10:00:00Z",
 *   provenance: ["paygrove 0.1.0"], cautions: ["Not legal advice."],
 *   sections: [{ title: "Bands", body: paragraph("text") }],
 * });
 * assert(html.startsWith("<!DOCTYPE html>"));
 * assert.match(html, /<title>Pay bands by &lt;level&gt;<\/title>/);
 * assert.match(html, /Content-Security-Policy" content="default-src 'none'/);
 * assert.doesNotMatch(html, /<script|\bsrc=|href="(?!#)|url\((?!#)/);
 * ```
 */
export function htmlPage(page: HtmlPage): string {
  const sections = page.sections.map((s, i) =>
    `<section id="s${i + 1}">\n<h2>${escapeHtml(s.title)}</h2>\n${s.body}\n</section>`
  ).join("\n");
  return `<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta http-equiv="Content-Security-Policy" content="${CSP}">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="generator" content="paygrove">
<title>${escapeHtml(page.title)}</title>
<style>${PAGE_CSS}</style>
</head>
<body>
<header>
<h1>${escapeHtml(page.title)}</h1>
<p class="question">${escapeHtml(page.question)}</p>
<p class="meta">Written <time datetime="${escapeHtml(page.created)}">${
    escapeHtml(page.created)
  }</time></p>
</header>
<aside class="cautions">
${page.cautions.map((c) => paragraph(c)).join("\n")}
</aside>
<main>
${sections}
</main>
<footer>
${page.provenance.map((p) => paragraph(p, "note")).join("\n")}
</footer>
</body>
</html>
`;
}

// No fetch of any kind: styles inline only, images only as data: URLs.
const CSP = "default-src 'none'; style-src 'unsafe-inline'; img-src data:; font-src data:";

// Screen and print: one column of at most 680 px (the charts' 640 px box
// and margins), so an A4 or Letter page (about 180 mm of text width at 14
// mm margins) takes every chart whole; a figure or table is never cut
// across pages. Greys and a dark blue: readable printed in greyscale.
const PAGE_CSS = `
:root { color-scheme: light; }
body { font: 15px/1.45 system-ui, -apple-system, "Segoe UI", Roboto, sans-serif; color: #1a1a1a;
  background: #fff; max-width: 680px; margin: 24px auto; padding: 0 16px; }
h1 { font-size: 1.6em; margin: 0 0 .2em; }
h2 { font-size: 1.2em; margin: 1.6em 0 .5em; border-bottom: 1px solid #999; break-after: avoid; }
.question { font-size: 1.1em; margin: .2em 0; }
.meta, .note { color: #555; font-size: .9em; }
.warning { border-left: 4px solid #444; padding-left: 8px; }
.cautions { border: 1px solid #777; padding: 4px 12px; margin: 1em 0; font-size: .92em; }
table { border-collapse: collapse; margin: .6em 0 1.2em; font-size: .8em; break-inside: avoid; }
caption { text-align: left; font-weight: 600; padding-bottom: .3em; }
th, td { border-bottom: 1px solid #ccc; padding: 3px 5px; text-align: left; vertical-align: bottom; }
td.num { text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }
figure.chart { margin: 1em 0 .4em; break-inside: avoid; }
figure.chart .box { width: 640px; overflow: hidden; }
figure.chart svg { display: block; }
figcaption { font-size: .9em; color: #333; margin-top: .3em; }
footer { margin-top: 2em; border-top: 1px solid #999; }
@page { margin: 14mm; }
@media print {
  body { margin: 0; max-width: none; font-size: 11pt; }
  figure.chart, table { break-inside: avoid; }
}
`;

/**
 * Whether a report path asks for HTML (by its extension, `.html` or
 * `.htm`, in any case); anything else is Markdown, as before.
 *
 * @example
 * ```ts
 * import assert from "node:assert/strict";
 * import { isHtmlPath } from "./page.ts";
 * assert(isHtmlPath("bands.html") && isHtmlPath("B.HTM"));
 * assert(!isHtmlPath("bands.md") && !isHtmlPath("html"));
 * ```
 */
export function isHtmlPath(path: string): boolean {
  return /\.html?$/i.test(path);
}
