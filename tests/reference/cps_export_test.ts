// Reruns the R scripts of tests/reference/ (Debian r-base-core, r-cran-aer,
// r-cran-sandwich, r-cran-iso) into a temporary folder and requires each file they write
// to match the committed fixture: text exactly, numbers to a relative 1e-12
// (./_compare.ts), since R on another processor may print other last
// digits. Outside CI a script whose R packages are missing is skipped with
// a note; in CI (CI=true) it fails, so a missing install cannot pass
// unnoticed.
import assert from "node:assert/strict";
import { assertSameOutput } from "./_compare.ts";

const root = new URL("../../", import.meta.url).pathname;
const inCi = Deno.env.get("CI") === "true";

// Whether Rscript runs and has these packages.
async function rWith(packages: string[]): Promise<boolean> {
  const wanted = packages.map((p) => `'${p}'`).join(", ");
  try {
    const probe = await new Deno.Command("Rscript", {
      args: [
        "-e",
        `quit(status = if (all(sapply(c(${wanted}), requireNamespace, quietly = TRUE))) 0 else 1)`,
      ],
      stdout: "null",
      stderr: "null",
    }).output();
    return probe.success;
  } catch {
    return false;
  }
}

// Runs an R script (from the project root, where the scripts read their
// inputs) into a temporary folder and compares each file it writes.
async function rerunR(script: string, args: (out: string) => string[], files: [string, string][]) {
  const out = await Deno.makeTempDir({ prefix: "paygrove-r-" });
  try {
    const run = await new Deno.Command("Rscript", {
      args: [`${root}tests/reference/${script}`, ...args(out)],
      cwd: root,
      stdout: "piped",
      stderr: "piped",
      signal: AbortSignal.timeout(120_000),
    }).output();
    assert.ok(run.success, new TextDecoder().decode(run.stderr));
    for (const [written, committed] of files) {
      assertSameOutput(
        committed,
        await Deno.readTextFile(`${out}/${written}`),
        await Deno.readTextFile(`${root}${committed}`),
      );
    }
  } finally {
    await Deno.remove(out, { recursive: true });
  }
}

const RERUNS: {
  name: string;
  script: string;
  packages: string[];
  args: (out: string) => string[];
  files: [string, string][];
}[] = [
  {
    name: "the CPS fixtures match a fresh export from R's AER package",
    script: "export_cps.R",
    packages: ["AER"],
    args: (out) => [out],
    files: [["cps1988.csv", "fixtures/cps1988.csv"], ["cps1985.csv", "fixtures/cps1985.csv"]],
  },
  {
    name: "the lm fixture matches a fresh fit by R's lm()",
    script: "lm_cps1988.R",
    packages: ["AER"],
    args: (out) => [`${out}/lm_cps1988.json`],
    files: [["lm_cps1988.json", "fixtures/reference/lm_cps1988.json"]],
  },
  {
    name: "the HC1 fixture matches a fresh fit by R's lm() and sandwich::vcovHC",
    script: "hc1_cps1988.R",
    packages: ["AER", "sandwich"],
    args: (out) => [`${out}/hc1_cps1988.json`],
    files: [["hc1_cps1988.json", "fixtures/reference/hc1_cps1988.json"]],
  },
  {
    name: "the pooled linear gap decomposition matches a fresh fit by R's lm()",
    script: "oaxaca_pooled.R",
    packages: [],
    args: (out) => [`${out}/oaxaca_pooled.json`],
    files: [["oaxaca_pooled.json", "fixtures/reference/oaxaca_pooled.json"]],
  },
  {
    name: "the isotonic fixture matches a fresh run of R's Iso::pava",
    script: "pava.R",
    packages: ["Iso"],
    args: (out) => [`${out}/pava.json`],
    files: [["pava.json", "fixtures/reference/pava.json"]],
  },
  {
    name: "the aliased-column tables and their lm() fits match a fresh run of R",
    script: "lm_aliased.R",
    packages: [],
    args: (out) => [out, `${out}/aliased`],
    files: [
      ["lm_aliased.json", "fixtures/reference/lm_aliased.json"],
      ["aliased/one_person_site.csv", "fixtures/aliased/one_person_site.csv"],
      ["aliased/months_and_years.csv", "fixtures/aliased/months_and_years.csv"],
      ["aliased/twenty_rows.csv", "fixtures/aliased/twenty_rows.csv"],
    ],
  },
];

for (const rerun of RERUNS) {
  const available = await rWith(rerun.packages);
  const needs = rerun.packages.length === 0
    ? "Rscript"
    : `Rscript with ${rerun.packages.join(" and ")}`;
  if (!available && !inCi) {
    console.warn(`cps_export_test: ${needs} not found; "${rerun.name}" skipped`);
  }
  Deno.test({
    name: rerun.name,
    ignore: !available && !inCi,
    fn: async () => {
      assert.ok(available, `${needs} is missing: CI must install it (see .ci/run)`);
      await rerunR(rerun.script, rerun.args, rerun.files);
    },
  });
}
