/**
 * A messy spreadsheet export of the invented demo company, as a European
 * payroll system writes it: semicolons, decimal commas, amounts such as
 * "31.940,00 €", windows-1252 text (so "€" is the byte 0x80), a site whose
 * name needs a byte above 127. Built from fixtures/demo_company.csv, so the
 * values it must read back to are known exactly.
 *
 * @module
 */

const DEMO = new URL("../fixtures/demo_company.csv", import.meta.url).pathname;

/** One person of the messy export, as it must read back. */
export interface MessyRow {
  id: string;
  level: string;
  years: number;
  site: string;
  pay: number;
}

// windows-1252 for the characters used here (ASCII, Latin-1 letters and €).
function windows1252(text: string): Uint8Array {
  const bytes = new Uint8Array(text.length);
  for (let i = 0; i < text.length; i++) {
    const code = text.charCodeAt(i);
    if (code === 0x20ac) bytes[i] = 0x80;
    else if (code < 0x100 && (code < 0x80 || code >= 0xa0)) bytes[i] = code;
    else throw new Error(`not in windows-1252 here: ${text[i]}`);
  }
  return bytes;
}

/** "143.100,00 €" for 143100 (two decimals, points between thousands). */
export function euroCell(value: number): string {
  const [whole, cents] = value.toFixed(2).split(".");
  return `${whole.replace(/\B(?=(\d{3})+$)/g, ".")},${cents} €`;
}

/**
 * The first `rows` people of the demo company as a messy export: the bytes
 * and the values each row must read back to.
 */
export function messyExport(rows: number): { bytes: Uint8Array; text: string; rows: MessyRow[] } {
  const lines = Deno.readTextFileSync(DEMO).trim().split("\n").slice(1, rows + 1);
  const people: MessyRow[] = [];
  const out = ["personal_nr;job_family;level;years_experience;site;remote;annual_salary"];
  for (const line of lines) {
    const c = line.split(",");
    const site = c[5] === "Eastgate" ? "Müllerstraße" : c[5];
    const person = { id: c[0], level: c[2], years: Number(c[3]), site, pay: Number(c[10]) };
    people.push(person);
    out.push(
      [
        person.id,
        c[1],
        person.level,
        String(person.years).replace(".", ","),
        site,
        c[8],
        euroCell(person.pay),
      ].join(";"),
    );
  }
  const text = out.join("\r\n") + "\r\n";
  return { bytes: windows1252(text), text, rows: people };
}
