// HTML reports as a reader gets them, without a browser: every figure's
// data-value equal to the command's JSON, nothing in the page that reaches
// outside it, untrusted names shown as text, and no figure of a hidden cell
// anywhere in the markup. (tests/e2e/html_browser_test.ts opens them in
// Chromium.)
import assert from "node:assert/strict";
import { parseHTML } from "linkedom";
import { fitDemoModel, paygrove, ROOT } from "./_cli.ts";

const dir = await Deno.makeTempDir({ prefix: "paygrove-html-" });
const demo = `${ROOT}fixtures/demo_company.csv`;
const model = `${dir}/demo.model.json`;
await fitDemoModel(model);

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
  // The same names as the groups of a gap check, in its charts and tables.
  const gapReport = `${dir}/hostile_gap.html`;
  const gap = await paygrove([
    "gap",
    path,
    "--target",
    "base_pay_eur",
    "--group",
    "site",
    "--trees",
    "10",
    "--report",
    gapReport,
  ]);
  assert.equal(gap.code, 0, gap.stderr);
  const gapHtml = await Deno.readTextFile(gapReport);
  assert.deepEqual(outsideReferences(gapHtml), []);
  assert.doesNotMatch(gapHtml, /<img|<svg onload|<script/i);
  assert(dom(gapHtml).body.textContent.includes("<svg onload=alert(3)>"));
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

// Every data-value of a page, in document order.
// deno-lint-ignore no-explicit-any
const valuesOf = (node: any): number[] =>
  [...node.querySelectorAll("[data-value]")].map((el) => Number(el.getAttribute("data-value")));

// The table of a page whose caption starts with `caption`.
// deno-lint-ignore no-explicit-any
function tableCaptioned(page: any, caption: string): any {
  const table = [...page.querySelectorAll("table")].find((t) =>
    t.querySelector("caption")?.textContent.startsWith(caption)
  );
  assert(table !== undefined, `a table captioned "${caption}"`);
  return table;
}

Deno.test("estimate, compare and sweep --report .html: their figures are the JSON's", async () => {
  const profile = ["--set", "level=G4", "--set", "job_family=Sales"];
  const est = await paygrove([
    "estimate",
    model,
    ...profile,
    "--offer",
    "70k",
    "--report",
    `${dir}/estimate.html`,
    "--json",
  ]);
  assert.equal(est.code, 0, est.stderr);
  const e = JSON.parse(est.stdout);
  const ePage = dom(await Deno.readTextFile(`${dir}/estimate.html`));
  assert.deepEqual(outsideReferences(await Deno.readTextFile(`${dir}/estimate.html`)), []);
  assert.deepEqual(valuesOf(tableCaptioned(ePage, "The estimate and its intervals")), [
    e.estimate,
    e.confidence.low,
    e.confidence.high,
    e.range.low,
    e.range.high,
  ]);
  assert.deepEqual(
    valuesOf(tableCaptioned(ePage, "Each attribute's part")),
    e.contributions.parts.flatMap((p: { percent: number; money: number }) => [p.percent, p.money]),
  );
  assert.deepEqual(
    valuesOf(tableCaptioned(ePage, "Where the offer sits")),
    [
      e.offer.offerToEstimate,
      e.offer.rangePosition,
      e.offer.shareBelow,
      e.offer.reach.estimate.offer,
    ],
  );
  assert.deepEqual(
    valuesOf(tableCaptioned(ePage, "Each condition")),
    e.path.flatMap((p: { rows: number; value: number }) => [p.rows, p.value]),
  );
  // The histogram's counts are the trees.
  const counts = valuesOf(tableCaptioned(ePage, "Trees per span")).filter((_, i) => i % 3 === 2);
  assert.equal(counts.reduce((a, b) => a + b, 0), e.trees.length);

  const cmp = await paygrove([
    "compare",
    model,
    ...profile,
    "--change",
    "level=+1",
    "--report",
    `${dir}/compare.html`,
    "--json",
  ]);
  assert.equal(cmp.code, 0, cmp.stderr);
  const c = JSON.parse(cmp.stdout);
  const cPage = dom(await Deno.readTextFile(`${dir}/compare.html`));
  const d = c.difference;
  assert.deepEqual(valuesOf(tableCaptioned(cPage, "The base, the changed profile")), [
    c.base.estimate,
    c.base.confidence.low,
    c.base.confidence.high,
    c.base.range.low,
    c.base.range.high,
    c.changed.estimate,
    c.changed.confidence.low,
    c.changed.confidence.high,
    c.changed.range.low,
    c.changed.range.high,
    d.estimate,
    d.low,
    d.high,
    d.relative.estimate,
    d.relative.low,
    d.relative.high,
  ]);

  const sw = await paygrove([
    "sweep",
    model,
    ...profile,
    "--vary",
    "level",
    "--report",
    `${dir}/sweep.html`,
    "--json",
  ]);
  assert.equal(sw.code, 0, sw.stderr);
  const s = JSON.parse(sw.stdout);
  const sPage = dom(await Deno.readTextFile(`${dir}/sweep.html`));
  assert.deepEqual(
    valuesOf(tableCaptioned(sPage, "The estimate at each level")),
    s.points.flatMap((
      p: {
        estimate: number;
        confidence: { low: number; high: number };
        range: { low: number; high: number };
      },
    ) => [
      p.estimate,
      p.confidence.low,
      p.confidence.high,
      p.range.low,
      p.range.high,
    ]),
  );
  // A report name that is not HTML is refused before any work.
  const md = await paygrove(["estimate", model, "--report", `${dir}/e.md`]);
  assert.equal(md.code, 2);
  assert.match(md.stderr, /name the file \.html/);
});

Deno.test("fit and gap --report .html: their figures are the JSON's", async () => {
  const fitRun = await paygrove([
    "fit",
    demo,
    "--target",
    "base_pay_eur",
    "--trees",
    "20",
    "--folds",
    "3",
    "--out",
    `${dir}/f.model.json`,
    "--report",
    `${dir}/fit.html`,
    "--json",
  ]);
  assert.equal(fitRun.code, 0, fitRun.stderr);
  const f = JSON.parse(fitRun.stdout);
  const fHtml = await Deno.readTextFile(`${dir}/fit.html`);
  assert.deepEqual(outsideReferences(fHtml), []);
  const fPage = dom(fHtml);
  const q = f.quality;
  assert.deepEqual(valuesOf(tableCaptioned(fPage, "Accuracy on rows")), [
    ...[q.constant, q.linear, q.reference, q.ensemble].flatMap((a) => [
      a.money.rmse,
      a.money.mae,
      a.money.r2,
    ]),
  ]);
  const importance = valuesOf(tableCaptioned(fPage, "Importance of each attribute"));
  const sorted = [...f.importance].sort((a, b) => b.permutation - a.permutation);
  assert.deepEqual(
    importance,
    sorted.flatMap((i: { permutation: number; permutationSd: number; impurity: number }) => [
      i.permutation,
      i.permutationSd,
      i.impurity,
    ]),
  );
  // The report is not the model file, in any spelling.
  const same = await paygrove([
    "fit",
    demo,
    "--target",
    "base_pay_eur",
    "--out",
    `${dir}/same.html`,
    "--report",
    `${dir}/./same.html`,
  ]);
  assert.equal(same.code, 2);

  const gapRun = await paygrove([
    "gap",
    demo,
    "--target",
    "base_pay_eur",
    "--group",
    "gender",
    "--within",
    "level",
    "--trees",
    "20",
    "--report",
    `${dir}/gap.html`,
    "--json",
  ]);
  assert.equal(gapRun.code, 0, gapRun.stderr);
  const g = JSON.parse(gapRun.stdout);
  const gHtml = await Deno.readTextFile(`${dir}/gap.html`);
  assert.deepEqual(outsideReferences(gHtml), []);
  const gPage = dom(gHtml);
  const figures = (
    x: {
      rows: number;
      rawMean: number;
      rawMedian: number;
      adjusted: number;
      low: number;
      high: number;
    },
  ) => [
    x.rows,
    x.rawMean,
    x.rawMedian,
    x.adjusted,
    x.low,
    x.high,
  ];
  assert.deepEqual(
    valuesOf(tableCaptioned(gPage, "Gaps against Man, everyone")),
    g.overall.gaps.flatMap(figures),
  );
  assert.deepEqual(
    valuesOf(tableCaptioned(gPage, "Gaps against Man per category")),
    g.categories.filter((c: { suppressed: boolean }) => !c.suppressed).flatMap((c: { gaps: [] }) =>
      c.gaps.flatMap(figures)
    ),
  );
  // A category too small to report shows its name and nothing else.
  const hidden = g.categories.filter((c: { suppressed: boolean }) => c.suppressed);
  assert(hidden.length > 0);
  const rows = [...tableCaptioned(gPage, "Gaps against Man per category").querySelectorAll("tr")];
  for (const c of hidden) {
    const row = rows.find((r) => r.querySelector("td")?.textContent === c.name);
    assert.equal(row.querySelectorAll("td").length, 2);
    assert.equal(row.querySelectorAll("[data-value]").length, 0);
  }
  assert.match(gHtml, /not proof of discrimination/);
});

Deno.test("review --report .html: counts and costs only, no one's name or pay, small costs withheld", async () => {
  const run = await paygrove([
    "review",
    demo,
    "--target",
    "base_pay_eur",
    "--within",
    "level,site",
    "--trees",
    "20",
    "--report",
    `${dir}/review.html`,
    "--json",
  ]);
  assert.equal(run.code, 0, run.stderr);
  const r = JSON.parse(run.stdout);
  const html = await Deno.readTextFile(`${dir}/review.html`);
  assert.deepEqual(outsideReferences(html), []);
  // The attack: find anyone in the page, by identifier or by pay.
  const values = new Set(valuesOf(dom(html)));
  for (const p of r.people) {
    assert(!html.includes(p.id), `${p.id} named in the report`);
    assert(!values.has(p.pay), `${p.id}'s pay in the report`);
  }
  // Everyone's counts as the JSON has them.
  const o = r.overall;
  assert.deepEqual(valuesOf(tableCaptioned(dom(html), "Everyone")), [
    o.people,
    o.under,
    o.over,
    o.cost,
  ]);
  // A category with fewer than the privacy minimum under shows no cost.
  const rows = [
    ...tableCaptioned(dom(html), "Under and over the range per category").querySelectorAll(
      "tbody tr",
    ),
  ];
  let withheld = 0;
  for (const c of r.categories) {
    const row = rows.find((x) => x.querySelector("td").textContent === c.name);
    if (c.suppressed) {
      assert.equal(row.querySelectorAll("[data-value]").length, 0);
      continue;
    }
    const cells = valuesOf(row);
    if (c.under < r.privacyMin) {
      assert.deepEqual(cells, [c.people, c.under, c.over]);
      withheld++;
    } else assert.deepEqual(cells, [c.people, c.under, c.over, c.cost]);
  }
  assert(withheld > 0, "some category has fewer than the minimum under");
});

Deno.test("one file cannot be two outputs: review --report onto --out, bands --people onto --out", async () => {
  const shared = `${dir}/one.csv`;
  const review = await paygrove([
    "review",
    demo,
    "--target",
    "base_pay_eur",
    "--out",
    shared,
    "--report",
    `${dir}/./one.csv`,
  ]);
  assert.equal(review.code, 2);
  assert.match(review.stderr, /--report: .* is the --out file/);
  const bands = await paygrove([
    "bands",
    model,
    "--table",
    demo,
    "--out",
    shared,
    "--people",
    shared,
  ]);
  assert.equal(bands.code, 2);
  assert.match(bands.stderr, /--people: .* is the --out file/);
  // Refused before anything was written.
  await assert.rejects(() => Deno.stat(shared), Deno.errors.NotFound);
});
