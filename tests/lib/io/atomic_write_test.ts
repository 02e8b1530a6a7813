import assert from "node:assert/strict";
import { DataError, OptionError } from "../../../lib/errors.ts";
import {
  assertCanWrite,
  removePendingFiles,
  sameFile,
  writeFileAtomic,
} from "../../../lib/io/atomic_write.ts";

const posix = Deno.build.os !== "windows";
const modeOf = (path: string) => Deno.statSync(path).mode! & 0o777;
const listing = (folder: string) => [...Deno.readDirSync(folder)].map((e) => e.name).sort();

async function rejection(run: () => Promise<unknown>): Promise<Error> {
  try {
    await run();
  } catch (error) {
    return error as Error;
  }
  assert.fail("did not throw");
}

Deno.test("a new file is written whole and no temporary file is left", async () => {
  const folder = Deno.makeTempDirSync();
  const path = `${folder}/out.csv`;
  await writeFileAtomic(path, "id,pay\n1,50000\n");
  assert.equal(Deno.readTextFileSync(path), "id,pay\n1,50000\n");
  assert.deepEqual(listing(folder), ["out.csv"]);
  assert.equal(removePendingFiles(), 0);
});

Deno.test("bytes are written as given, empty data included", async () => {
  const folder = Deno.makeTempDirSync();
  const bytes = Uint8Array.from({ length: 70_000 }, (_, i) => (i * 7) % 256);
  await writeFileAtomic(`${folder}/a.bin`, bytes);
  assert.deepEqual(Deno.readFileSync(`${folder}/a.bin`), bytes);
  await writeFileAtomic(`${folder}/empty.txt`, "");
  assert.equal(Deno.statSync(`${folder}/empty.txt`).size, 0);
});

Deno.test("an existing file is kept unless force, then replaced keeping its mode", async () => {
  const folder = Deno.makeTempDirSync();
  const path = `${folder}/model.json`;
  Deno.writeTextFileSync(path, "old");
  if (posix) Deno.chmodSync(path, 0o640);
  const error = await rejection(() => writeFileAtomic(path, "new", { option: "--model" }));
  assert.ok(error instanceof OptionError);
  assert.equal(error.message, `--model: ${path} already exists; add force to replace it`);
  assert.equal(Deno.readTextFileSync(path), "old");
  await writeFileAtomic(path, "new", { force: true });
  assert.equal(Deno.readTextFileSync(path), "new");
  if (posix) assert.equal(modeOf(path), 0o640);
  if (posix) Deno.chmodSync(path, 0o600);
  await writeFileAtomic(path, "newer", { force: true });
  if (posix) assert.equal(modeOf(path), 0o600);
  assert.deepEqual(listing(folder), ["model.json"]);
});

Deno.test("a private file is created 0600; a public one is not restricted", async () => {
  if (!posix) return;
  const folder = Deno.makeTempDirSync();
  await writeFileAtomic(`${folder}/review.csv`, "x", { private: true });
  assert.equal(modeOf(`${folder}/review.csv`), 0o600);
  await writeFileAtomic(`${folder}/plain.csv`, "x");
  // 0666 less the umask: at least the owner's read and write, never execute.
  const mode = modeOf(`${folder}/plain.csv`);
  assert.equal(mode & 0o600, 0o600);
  assert.equal(mode & 0o111, 0);
  // A private replacement of a world-readable file is 0600, not the old mode.
  Deno.chmodSync(`${folder}/plain.csv`, 0o644);
  await writeFileAtomic(`${folder}/plain.csv`, "y", { private: true, force: true });
  assert.equal(modeOf(`${folder}/plain.csv`), 0o600);
});

Deno.test("folders, links and FIFOs are never replaced, even with force", async () => {
  const folder = Deno.makeTempDirSync();
  const sub = `${folder}/sub`;
  Deno.mkdirSync(sub);
  const asFolder = await rejection(() => writeFileAtomic(sub, "x", { force: true }));
  assert.ok(asFolder instanceof OptionError);
  assert.equal(asFolder.message, `out: ${sub} is a folder; give the path of a file to write`);
  if (!posix) return;
  Deno.writeTextFileSync(`${folder}/target.txt`, "kept");
  Deno.symlinkSync(`${folder}/target.txt`, `${folder}/link`);
  const asLink = await rejection(() => writeFileAtomic(`${folder}/link`, "x", { force: true }));
  assert.ok(asLink instanceof OptionError);
  assert.match(asLink.message, /is not a regular file \(a symbolic link\)/);
  assert.equal(Deno.readTextFileSync(`${folder}/target.txt`), "kept");
  const fifo = `${folder}/pipe`;
  const made = new Deno.Command("mkfifo", { args: [fifo] }).outputSync();
  assert.ok(made.success);
  const asFifo = await rejection(() => writeFileAtomic(fifo, "x", { force: true }));
  assert.match(asFifo.message, /is not a regular file \(a FIFO\)/);
  const asDevice = await rejection(() => assertCanWrite("/dev/null", true, "--out"));
  assert.match(asDevice.message, /\/dev\/null is not a regular file \(a device\)/);
  assert.deepEqual(listing(folder), ["link", "pipe", "sub", "target.txt"]);
});

Deno.test("a folder that does not exist is a data error, and nothing is left", async () => {
  const folder = Deno.makeTempDirSync();
  const path = `${folder}/missing/out.csv`;
  const error = await rejection(() => writeFileAtomic(path, "x", { option: "--csv" }));
  assert.ok(error instanceof DataError);
  assert.equal(error.message, `--csv: cannot write ${path} (its folder does not exist)`);
  const checked = await rejection(() => assertCanWrite(path, false, "--csv"));
  assert.ok(checked instanceof DataError);
  assert.equal(checked.message, `--csv: cannot write ${path} (its folder does not exist)`);
  assert.deepEqual(listing(folder), []);
});

Deno.test("a path under a regular file cannot be checked", async () => {
  if (!posix) return;
  const file = Deno.makeTempFileSync();
  const error = await rejection(() => writeFileAtomic(`${file}/out.csv`, "x"));
  assert.ok(error instanceof DataError);
  assert.match(error.message, new RegExp(`^out: cannot check ${file}/out.csv \\(`));
});

Deno.test("assertCanWrite leaves no probe behind and refuses the files read", async () => {
  const folder = Deno.makeTempDirSync();
  await assertCanWrite(`${folder}/new.csv`, false, "--out");
  assert.deepEqual(listing(folder), []);
  Deno.writeTextFileSync(`${folder}/pay.csv`, "pay\n1\n");
  const error = await rejection(() =>
    assertCanWrite(`${folder}/./pay.csv`, true, "out", [`${folder}/pay.csv`])
  );
  assert.ok(error instanceof OptionError);
  assert.equal(
    error.message,
    `out: ${folder}/./pay.csv is ${folder}/pay.csv, which this run reads; write the output elsewhere`,
  );
  // A different file among those read does not stop it (with force, as it exists).
  await assertCanWrite(`${folder}/pay.csv`, true, "out", [`${folder}/other.csv`]);
  assert.deepEqual(listing(folder), ["pay.csv"]);
});

Deno.test("sameFile: spellings, hard and symbolic links are the same file; others are not", async () => {
  const folder = Deno.makeTempDirSync();
  const a = `${folder}/a.json`;
  Deno.writeTextFileSync(a, "{}");
  Deno.writeTextFileSync(`${folder}/b.json`, "{}");
  assert.equal(await sameFile(a, `${folder}/sub/../a.json`), true);
  assert.equal(await sameFile(a, `${folder}/b.json`), false);
  assert.equal(await sameFile(a, `${folder}/missing.json`), false);
  if (!posix) return;
  Deno.linkSync(a, `${folder}/hard.json`);
  Deno.symlinkSync(a, `${folder}/soft.json`);
  assert.equal(await sameFile(`${folder}/hard.json`, a), true);
  assert.equal(await sameFile(`${folder}/soft.json`, a), true);
});
