// HTML reports as a reader gets them, without a browser: every figure's
// data-value equal to the command's JSON, nothing in the page that reaches
// outside it, untrusted names shown as text, and no figure of a hidden cell
// anywhere in the markup. (tests/e2e/html_browser_test.ts opens them in
// Chromium.)
import assert from "node:assert/strict";
import { parseHTML } from "linkedom";
import { paygrove, ROOT } from "./_cli.ts";

const dir = await Deno.makeTempDir({ prefix: "paygrove-html-" });
const demo = `${ROOT}fixtures/demo_company.csv`;
const model = `${dir}/demo.model.json`;
const fitted = await paygrove([
  "fit",
  demo,
  "--target",
  "base_pay_eur",
  "--currency",
  "EUR",
  "--trees",
  "30",
  "--folds",
  "3",
  "--out",
  model,
]);
if (fitted.code !== 0) throw new Error(fitted.stderr);

// The page's DOM (linkedom's types are not Deno's DOM types).
// deno-lint-ignore no-explicit-any
const dom = (html: string): any => (parseHTML(html) as unknown as { document: unknown }).document;

/**
 * What no report may hold, read from the parsed page as a browser would see
 * it: a script or an embedding element; an attribute that loads or links
 * anywhere but an in-page `#` anchor or a `data:` URL; an event handler; a
 * CSS url() or @import in a style attribute or element.
 */
export function outsideReferences(html: string): string[] {
  const found: string[] = [];
  const loads = /^(?:src|srcset|href|xlink:href|action|formaction|poster|background|data|ping)$/i;
  const css = (text: string) => {
    for (const m of text.matchAll(/url\(\s*['"]?(?!#|data:)[^)]*\)|@import/gi)) found.push(m[0]);
  };
  for (const element of [...dom(html).querySelectorAll("*")]) {
    const name = element.tagName.toLowerCase();
    if (/^(?:script|iframe|object|embed|link|base|frame|frameset|portal)$/.test(name)) {
      found.push(`<${name}>`);
    }
    if (name === "style") css(element.textContent ?? "");
    if (name === "meta" && /refresh/i.test(element.getAttribute("http-equiv") ?? "")) {
      found.push("<meta refresh>");
    }
    for (const attribute of [...element.attributes]) {
      const value = attribute.value.trim();
      if (/^on/i.test(attribute.name)) found.push(`${attribute.name}=`);
      else if (loads.test(attribute.name) && !/^(?:#|data:)/i.test(value)) {
        found.push(`${attribute.name}="${value}"`);
      } else if (attribute.name === "style") css(value);
    }
  }
  return found;
}

Deno.test("the attack on 'nothing outside the page' is seen: a page with an outside image fails", () => {
  const bad =
    `<p style="background:url(https://x.invalid/a.png)"><img src="http://x.invalid/b"></p>` +
    `<a href="https://x.invalid">x</a><svg><use xlink:href="http://x.invalid/s#a"/></svg>`;
  assert.equal(outsideReferences(bad).length, 4);
  assert.deepEqual(outsideReferences(`<a href="#s1">x</a><p style="fill:url(#g)">`), []);
  assert.equal(
    outsideReferences(`<style>@import "x.css"; p { background: url(x.png) }</style>`).length,
    2,
  );
  assert.deepEqual(outsideReferences(`<p>&lt;img src=x onerror=alert(1)&gt;</p>`), []);
  assert.deepEqual(outsideReferences(`<svg onload="alert(1)"></svg><script></script>`), [
    "onload=",
    "<script>",
  ]);
});

Deno.test("bands --report .html: every data-value equals the JSON, nothing outside the page", async () => {
  const report = `${dir}/bands.html`;
  const run = await paygrove([
    "bands",
    model,
    "--table",
    demo,
    "--by",
    "level,site",
    "--report",
    report,
    "--json",
  ]);
  assert.equal(run.code, 0, run.stderr);
  const doc = JSON.parse(run.stdout);
  const html = await Deno.readTextFile(report);
  assert.deepEqual(outsideReferences(html), []);
  assert.match(html, /<meta http-equiv="Content-Security-Policy" content="default-src 'none'/);
  const page = dom(html);
  // The band table: one row per cell, in the JSON's order.
  const rows = [...page.querySelectorAll("table")[0].querySelectorAll("tbody tr")];
  assert.equal(rows.length, doc.cells.length);
  let compared = 0;
  rows.forEach((row, i) => {
    const cell = doc.cells[i];
    const tds = [...row.querySelectorAll("td")];
    assert.equal(tds[0].textContent, cell.key.join(" / "));
    const values = tds.slice(1).filter((td) => td.hasAttribute("data-value")).map((td) =>
      Number(td.getAttribute("data-value"))
    );
    if (cell.suppressed) {
      assert.deepEqual(values, []);
      assert.equal(tds[1].textContent, "too few to report");
      return;
    }
    assert.deepEqual(values, [
      cell.people,
      cell.currentPay.p25,
      cell.currentPay.median,
      cell.currentPay.p75,
      cell.band.min,
      cell.band.mid,
      cell.band.max,
      cell.spread,
      cell.outside.below,
      cell.outside.above,
    ]);
    compared += values.length;
  });
  assert(compared > 200, `${compared} figures compared`);
  // The ladder table's progression and overlap.
  const ladder = [...page.querySelectorAll("table")[1].querySelectorAll("td[data-value]")]
    .map((td) => Number(td.getAttribute("data-value")));
  const expected = doc.ladders.flatMap((l: { progression: number[]; overlap: number[] }) =>
    l.progression.flatMap((p, k) => [p, l.overlap[k]])
  );
  assert.deepEqual(ladder, expected);
  // A chart per site (28 or more bands), each in its fixed box with a caption.
  const figures = [...page.querySelectorAll("figure.chart")];
  assert(figures.length >= 1);
  for (const f of figures) {
    assert(f.querySelector("svg") !== null && f.querySelector("figcaption") !== null);
  }
  // The cautions and where the figures come from.
  assert.match(html, /run the gap check first/);
  assert.match(html, /not what anyone should be paid/);
  assert.match(html, /paygrove \d+\.\d+\.\d+, model format \d+, fitted/);
});

Deno.test("bands --report .html: hostile site names appear as text, never as markup", async () => {
  const lines = (await Deno.readTextFile(demo)).trim().split("\n");
  const header = lines[0].split(",");
  const siteAt = header.indexOf("site");
  const hostile = [
    `"<script>alert(1)</script>"`,
    `"""><img src=x onerror=alert(2)>"`,
    `"<svg onload=alert(3)>"`,
  ];
  const table = [
    lines[0],
    ...lines.slice(1).map((line, i) => {
      const cells = line.split(",");
      cells[siteAt] = hostile[i % hostile.length];
      return cells.join(",");
    }),
  ];
  const path = `${dir}/hostile.csv`;
  await Deno.writeTextFile(path, table.join("\n") + "\n");
  const hostileModel = `${dir}/hostile.model.json`;
  const fit = await paygrove([
    "fit",
    path,
    "--target",
    "base_pay_eur",
    "--trees",
    "10",
    "--folds",
    "3",
    "--out",
    hostileModel,
  ]);
  assert.equal(fit.code, 0, fit.stderr);
  const report = `${dir}/hostile.html`;
  const run = await paygrove([
    "bands",
    hostileModel,
    "--table",
    path,
    "--by",
    "level,site",
    "--report",
    report,
  ]);
  assert.equal(run.code, 0, run.stderr);
  const html = await Deno.readTextFile(report);
  assert.deepEqual(outsideReferences(html), []);
  assert.doesNotMatch(html, /<img|<svg onload|<script/i);
  // Shown as the text it is.
  const text = dom(html).body.textContent;
  assert(text.includes("<script>alert(1)</script>"), "the name is shown as text");
});

Deno.test("bands --report .html: the people of hidden cells leave no trace in the page", async () => {
  // Level x site x family: many cells under the privacy minimum.
  const args = ["--by", "level,site,job_family", "--json"];
  const first = await paygrove(["bands", model, "--table", demo, ...args]);
  assert.equal(first.code, 0, first.stderr);
  const doc = JSON.parse(first.stdout);
  const hidden = new Set(
    doc.cells.filter((c: { suppressed: boolean }) => c.suppressed).map((c: { key: string[] }) =>
      c.key.join("|")
    ),
  );
  assert(hidden.size >= 5, `${hidden.size} hidden cells`);
  const lines = (await Deno.readTextFile(demo)).trim().split("\n");
  const header = lines[0].split(",");
  const at = (name: string) => header.indexOf(name);
  // Everyone in a hidden cell paid 7,777 more: the page must not change.
  let changed = 0;
  const altered = [
    lines[0],
    ...lines.slice(1).map((line) => {
      const cells = line.split(",");
      const key = [cells[at("level")], cells[at("site")], cells[at("job_family")]].join("|");
      if (!hidden.has(key)) return line;
      changed++;
      cells[at("base_pay_eur")] = String(Number(cells[at("base_pay_eur")]) + 7777);
      return cells.join(",");
    }),
  ];
  assert(changed >= 5);
  const alteredPath = `${dir}/altered.csv`;
  await Deno.writeTextFile(alteredPath, altered.join("\n") + "\n");
  const pages: string[] = [];
  for (const [table, name] of [[demo, "a.html"], [alteredPath, "b.html"]]) {
    const run = await paygrove([
      "bands",
      model,
      "--table",
      table,
      "--by",
      "level,site,job_family",
      "--report",
      `${dir}/${name}`,
    ]);
    assert.equal(run.code, 0, run.stderr);
    // The date it was written is the one thing allowed to differ.
    pages.push(
      (await Deno.readTextFile(`${dir}/${name}`)).replace(/Written <time[^]*?<\/time>/, ""),
    );
  }
  assert.equal(pages[0], pages[1]);
});
