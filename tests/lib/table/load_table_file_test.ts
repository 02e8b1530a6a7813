import assert from "node:assert/strict";
import { DataError } from "../../../lib/errors.ts";
import {
  loadTableFile,
  readTableText,
  TABLE_MAX_BYTES,
  TEXT_TABLE_MAX_BYTES,
} from "../../../lib/table/load_table_file.ts";

function tempWith(bytes: string | Uint8Array): string {
  const path = Deno.makeTempFileSync({ suffix: ".csv" });
  if (typeof bytes === "string") Deno.writeTextFileSync(path, bytes);
  else Deno.writeFileSync(path, bytes);
  return path;
}
async function refusal(run: () => Promise<unknown>): Promise<DataError> {
  try {
    await run();
  } catch (error) {
    assert.ok(error instanceof DataError, String(error));
    return error;
  }
  assert.fail("no error");
}
const tooLarge = (path: string, mib: number) =>
  `${path} is larger than the ${mib} MiB paygrove reads as a table; reading stopped there ` +
  `(is it the right file? a larger table can be split into parts)`;

Deno.test("the bounds are 1 GiB for a table and 256 MiB for one read whole", () => {
  assert.equal(TABLE_MAX_BYTES, 1024 * 1024 * 1024);
  assert.equal(TEXT_TABLE_MAX_BYTES, 256 * 1024 * 1024);
});

Deno.test("a file is loaded with its path as the file and its values read", async () => {
  const path = tempWith("level,pay\nL1,50000\nL2,61000\nL1,NA\n");
  const table = await loadTableFile(path, { target: "pay" });
  assert.equal(table.rows, 2);
  assert.equal(table.source.file, path);
  assert.equal(table.source.bytes, 10 + 9 + 9 + 6); // "level,pay\n", two rows of 9, "L1,NA\n"
  assert.deepEqual(table.excluded, { count: 1, lines: [4] });
  const pay = table.columns[1] as { values: Float64Array };
  assert.deepEqual(Array.from(pay.values), [50000, 61000]);
});

Deno.test("progress is reported as bytes read of the file's size, ending at the size", async () => {
  const rows = Array.from({ length: 20_000 }, (_, i) => `L${i % 5},${50000 + i}`);
  const text = ["level,pay", ...rows].join("\n") + "\n";
  const path = tempWith(text);
  const seen: [number, number][] = [];
  const table = await loadTableFile(
    path,
    { target: "pay" },
    (read, total) => seen.push([read, total]),
  );
  assert.equal(table.rows, 20_000);
  const size = new TextEncoder().encode(text).length;
  assert.ok(seen.length >= 1);
  assert.ok(seen.every(([, total]) => total === size));
  assert.equal(seen.at(-1)![0], size);
  for (let i = 1; i < seen.length; i++) assert.ok(seen[i][0] > seen[i - 1][0]);
});

Deno.test("a regular file over the bound is refused before reading, saying the bound", async () => {
  const path = tempWith("a".repeat(2 ** 20 + 1));
  const error = await refusal(() => loadTableFile(path, {}, undefined, 2 ** 20));
  assert.equal(error.message, tooLarge(path, 1));
  assert.equal(error.location.file, path);
  const text = await refusal(() => readTableText(path, "utf-8", 2 ** 20));
  assert.equal(text.message, tooLarge(path, 1));
  // At exactly the bound it is read.
  const exact = tempWith("p\n" + "1\n".repeat(2 ** 19 - 1));
  assert.equal((await readTableText(exact, "utf-8", 2 ** 20)).length, 2 ** 20);
});

// A FIFO fed forever has no size: the bound stops the reading itself.
function endlessFifo(): { path: string; child: Deno.ChildProcess } {
  const path = `${Deno.makeTempDirSync()}/endless.csv`;
  assert.ok(new Deno.Command("mkfifo", { args: [path] }).outputSync().success);
  const child = new Deno.Command("sh", {
    args: ["-c", `(echo level,pay; yes L1,50000) > '${path}' 2>/dev/null`],
    stdout: "null",
    stderr: "null",
  }).spawn();
  return { path, child };
}

Deno.test("an endless stream stops at the bound (loadTableFile)", async () => {
  if (Deno.build.os === "windows") return;
  const { path, child } = endlessFifo();
  const error = await refusal(() => loadTableFile(path, { target: "pay" }, undefined, 2 ** 20));
  assert.equal(error.message, tooLarge(path, 1));
  await child.status; // the writer ends when the reader has gone (SIGPIPE)
});

Deno.test("an endless stream stops at the bound (readTableText)", async () => {
  if (Deno.build.os === "windows") return;
  const { path, child } = endlessFifo();
  const error = await refusal(() => readTableText(path, "utf-8", 2 ** 20));
  assert.equal(error.message, tooLarge(path, 1));
  await child.status;
});

Deno.test("a missing file and a folder are said in words", async () => {
  const folder = Deno.makeTempDirSync();
  const missing = `${folder}/pay.csv`;
  assert.equal((await refusal(() => loadTableFile(missing))).message, `${missing}: no such file`);
  assert.equal((await refusal(() => readTableText(missing))).message, `${missing}: no such file`);
  assert.equal(
    (await refusal(() => loadTableFile(folder))).message,
    `${folder} is a folder, not a CSV file`,
  );
  assert.equal(
    (await refusal(() => readTableText(folder))).message,
    `${folder} is a folder, not a CSV file`,
  );
});

Deno.test("binary input is refused at its first piece, naming the file", async () => {
  for (const run of [() => loadTableFile("/dev/zero"), () => readTableText("/dev/zero")]) {
    const error = await refusal(run);
    assert.match(error.message, /^\/dev\/zero/);
    assert.doesNotMatch(error.message, /larger than/);
  }
});

Deno.test("readTableText: a byte-order mark is dropped, other encodings decoded", async () => {
  assert.equal(await readTableText(tempWith("\ufeffid,pay\n1,50\n")), "id,pay\n1,50\n");
  // "Zoë" in Latin-1 is 5a 6f eb.
  const latin1 = tempWith(Uint8Array.of(0x6e, 0x0a, 0x5a, 0x6f, 0xeb, 0x0a));
  assert.equal(await readTableText(latin1, "latin1"), "n\nZo\u00eb\n");
  assert.equal(await readTableText(tempWith("")), "");
});

Deno.test("readTableText: characters cut between pieces are put together again", async () => {
  const text = "name\n" + "Zoë Ødegård 日本\n".repeat(40_000);
  assert.equal(await readTableText(tempWith(text)), text);
});

Deno.test("readTableText: bytes that are not UTF-8 are refused", async () => {
  const path = tempWith(Uint8Array.of(0x6e, 0x0a, 0x5a, 0x6f, 0xeb, 0x0a));
  const error = await refusal(() => readTableText(path));
  assert.match(error.message, new RegExp(`^${path.replaceAll(".", "\\.")}`));
});
