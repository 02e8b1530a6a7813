// Reruns tests/reference/export_cps.R (R package AER, Debian r-cran-aer) and
// requires its output to equal the committed fixtures byte for byte. Where
// Rscript or AER is not installed the check is skipped with a note; CI
// installs both, so there it always runs.
import assert from "node:assert/strict";

const root = new URL("../../", import.meta.url).pathname;

async function rWithAer(): Promise<boolean> {
  try {
    const probe = await new Deno.Command("Rscript", {
      args: ["-e", "quit(status = if (requireNamespace('AER', quietly = TRUE)) 0 else 1)"],
      stdout: "null",
      stderr: "null",
    }).output();
    return probe.success;
  } catch {
    return false;
  }
}

const available = await rWithAer();
const inCi = Deno.env.get("CI") === "true";
if (!available) console.warn("cps_export_test: Rscript with AER not found; rerun skipped");

// Runs an R script into a temporary folder (within the suite's time budget)
// and requires each file it writes to equal the committed one byte for byte.
async function rerunR(script: string, args: (out: string) => string[], files: [string, string][]) {
  assert.ok(available, "CI must install r-base-core and r-cran-aer (see .ci/run)");
  const out = await Deno.makeTempDir({ prefix: "paygrove-r-" });
  try {
    const run = await new Deno.Command("Rscript", {
      args: [`${root}tests/reference/${script}`, ...args(out)],
      stdout: "piped",
      stderr: "piped",
      signal: AbortSignal.timeout(60_000),
    }).output();
    assert.ok(run.success, new TextDecoder().decode(run.stderr));
    for (const [written, committed] of files) {
      const fresh = await Deno.readFile(`${out}/${written}`);
      const kept = await Deno.readFile(`${root}${committed}`);
      assert.ok(fresh.length === kept.length && fresh.every((b, i) => b === kept[i]), committed);
    }
  } finally {
    await Deno.remove(out, { recursive: true });
  }
}

// In CI a missing R is a failure, not a skip.
Deno.test({
  name: "the CPS fixtures equal a fresh export from R's AER package",
  ignore: !available && !inCi,
  fn: () =>
    rerunR("export_cps.R", (out) => [out], [
      ["cps1988.csv", "fixtures/cps1988.csv"],
      ["cps1985.csv", "fixtures/cps1985.csv"],
    ]),
});

Deno.test({
  name: "the lm fixture equals a fresh fit by R's lm()",
  ignore: !available && !inCi,
  fn: () =>
    rerunR("lm_cps1988.R", (out) => [`${out}/lm_cps1988.json`], [
      ["lm_cps1988.json", "fixtures/reference/lm_cps1988.json"],
    ]),
});

Deno.test({
  name: "the HC1 fixture equals a fresh fit by R's lm() and sandwich::vcovHC",
  ignore: !available && !inCi,
  fn: () =>
    rerunR("hc1_cps1988.R", (out) => [`${out}/hc1_cps1988.json`], [
      ["hc1_cps1988.json", "fixtures/reference/hc1_cps1988.json"],
    ]),
});
