// Run by tests/e2e/task_permissions_test.ts with exactly the permissions of a
// task: prints the state of every permission Deno knows, one per line.
const names = ["read", "write", "net", "env", "run", "sys", "ffi", "import"] as const;
const lines: string[] = [];
for (const name of names) {
  const status = await Deno.permissions.query({ name } as Deno.PermissionDescriptor);
  lines.push(`${name}: ${status.state}`);
}
// Each variable the env allow-list may name, and one it must not.
const variables = (Deno.args[0] ?? "").split(",").filter((v) => v !== "");
for (const variable of [...variables, "HOME", "PATH"]) {
  const status = await Deno.permissions.query({ name: "env", variable });
  lines.push(`env ${variable}: ${status.state}`);
}
console.log(lines.join("\n"));
