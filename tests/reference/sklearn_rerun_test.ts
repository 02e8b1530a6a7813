// Reruns tests/reference/sklearn_trees.py (scikit-learn 1.2.1 from Debian's
// python3-sklearn) and requires its output to equal the committed fixtures in
// fixtures/reference/ byte for byte. It takes about a minute, so it runs in
// CI (CI=true) or when PAYGROVE_REFERENCE=1; elsewhere it is skipped with a
// note, and the learner's tests run from the committed fixtures.
import assert from "node:assert/strict";

const root = new URL("../../", import.meta.url).pathname;
const python = "/usr/bin/python3";
const wanted = Deno.env.get("CI") === "true" || Deno.env.get("PAYGROVE_REFERENCE") === "1";

async function sklearnVersion(): Promise<string | undefined> {
  try {
    const probe = await new Deno.Command(python, {
      args: ["-c", "import sklearn; print(sklearn.__version__)"],
      stdout: "piped",
      stderr: "null",
    }).output();
    return probe.success ? new TextDecoder().decode(probe.stdout).trim() : undefined;
  } catch {
    return undefined;
  }
}

const version = wanted ? await sklearnVersion() : undefined;
if (!wanted) {
  console.warn("sklearn_rerun_test: set PAYGROVE_REFERENCE=1 (CI does) to rerun scikit-learn");
} else if (version === undefined) console.warn("sklearn_rerun_test: python3-sklearn not found");

Deno.test({
  name: `the tree fixtures equal a fresh run of scikit-learn ${version ?? ""}`.trim(),
  ignore: version === undefined,
  fn: async () => {
    const out = await Deno.makeTempDir({ prefix: "paygrove-sklearn-" });
    try {
      const run = await new Deno.Command(python, {
        args: [`${root}tests/reference/sklearn_trees.py`, out],
        stdout: "piped",
        stderr: "piped",
      }).output();
      assert.ok(run.success, new TextDecoder().decode(run.stderr));
      for (const name of ["trees_diabetes.json", "trees_iris.json", "trees_cps1988.json"]) {
        const fresh = await Deno.readFile(`${out}/${name}`);
        const committed = await Deno.readFile(`${root}fixtures/reference/${name}`);
        assert.ok(
          fresh.length === committed.length && fresh.every((b, i) => b === committed[i]),
          `${name} differs from a fresh run`,
        );
      }
    } finally {
      await Deno.remove(out, { recursive: true });
    }
  },
});
