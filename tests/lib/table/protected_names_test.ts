import assert from "node:assert/strict";
import { isProtectedName, nameWords } from "../../../lib/table/protected_names.ts";

Deno.test("nameWords splits on separators and camelCase", () => {
  assert.deepEqual(nameWords("employeeAge_band"), ["employee", "age", "band"]);
  assert.deepEqual(nameWords("Date-of Birth"), ["date", "of", "birth"]);
  assert.deepEqual(nameWords("HRGender"), ["hr", "gender"]);
});

Deno.test("protected attributes are found by whole words of the name", () => {
  for (
    const name of [
      "sex",
      "Gender",
      "employee_gender",
      "race",
      "Ethnicity",
      "age",
      "AGE",
      "age_band",
      "employeeAge",
      "date_of_birth",
      "DOB",
      "birth_year",
      "religion",
      "disability_status",
      "marital_status",
      "married",
      "national_origin",
      "pregnancy",
      "veteran_status",
      "Sexual Orientation",
    ]
  ) {
    assert.equal(isProtectedName(name), true, name);
  }
});

Deno.test("names that only contain a protected word are not flagged", () => {
  for (
    const name of [
      "wage",
      "average",
      "usage",
      "Essex_site",
      "mileage",
      "stage",
      "racetrack_bonus",
      "sextant",
      "origin_office",
      "national_team",
      "base_pay",
      "manager",
    ]
  ) {
    assert.equal(isProtectedName(name), false, name);
  }
});
