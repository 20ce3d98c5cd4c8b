import { describe, expect, it } from "vitest";
import { ImportFileError, validateContainerRows, type ImportIssue } from "@/lib/imports";
import { basicLookups, containerTable, lookups } from "./fixtures";

/** Validates one row (on line 2) changed from a valid container, and returns its issues. */
function issuesFor(change: Record<string, string>, using = lookups): ImportIssue[] {
  return validateContainerRows(containerTable([change]), using).issues;
}

function onlyIssue(change: Record<string, string>, using = lookups): ImportIssue {
  const issues = issuesFor(change, using);
  expect(issues).toHaveLength(1);
  return issues[0];
}

describe("validating container rows", () => {
  it("turns a valid row into values ready to insert", () => {
    const result = validateContainerRows(containerTable([{ notes: "Keep away from the window" }]), lookups);
    expect(result.issues).toEqual([]);
    expect(result.rowCount).toBe(1);
    expect(result.rows).toEqual([
      {
        line: 2,
        label: "HR-000001",
        substanceId: 1,
        mixtureId: null,
        amount: 2.5,
        amountUnit: "L",
        capacity: 4,
        capacityUnit: "L",
        containerKind: "glass_bottle",
        state: "sealed",
        storageUnitId: 100,
        ownerId: 7,
        receivedAt: Date.UTC(2026, 0, 12),
        openedAt: Date.UTC(2026, 1, 1),
        expiresAt: Date.UTC(2028, 0, 31),
        notes: "Keep away from the window",
        defaulted: [],
      },
    ]);
  });

  it("fills in the default kind and state, and says so", () => {
    const [row] = validateContainerRows(containerTable([{ container_kind: "", state: "" }]), lookups).rows;
    expect(row.containerKind).toBe("glass_bottle");
    expect(row.state).toBe("sealed");
    expect(row.defaulted).toEqual(["containerKind", "state"]);
  });

  it("leaves optional values empty as null", () => {
    const [row] = validateContainerRows(
      containerTable([
        { capacity: "", capacity_unit: "", owner_email: "", received_on: "", opened_on: "", expires_on: "" },
      ]),
      lookups,
    ).rows;
    expect(row).toMatchObject({ capacity: null, capacityUnit: null, ownerId: null, receivedAt: null, openedAt: null });
  });

  it("reports a missing label", () => {
    expect(onlyIssue({ label: "" })).toEqual({
      line: 2,
      column: "label",
      value: "",
      message: "Label is missing: every container needs its label or barcode.",
    });
  });

  it("reports a missing amount", () => {
    expect(onlyIssue({ amount: "" })).toMatchObject({ line: 2, column: "amount", message: expect.stringMatching(/^Amount is missing/) });
  });

  it("reports an amount that is not a number", () => {
    expect(onlyIssue({ amount: "plenty" })).toEqual({
      line: 2,
      column: "amount",
      value: "plenty",
      message: "“plenty” is not a number. Use digits with a dot as the decimal mark, e.g. 2.5.",
    });
  });

  it("reports a negative amount, with a true minus sign", () => {
    expect(onlyIssue({ amount: "-5" }).message).toBe("Amount must be zero or more; got −5.");
    expect(onlyIssue({ amount: "−5" }).message).toBe("Amount must be zero or more; got −5.");
  });

  it("accepts an amount of zero (an empty container)", () => {
    expect(issuesFor({ amount: "0", state: "empty" })).toEqual([]);
  });

  it("refuses a decimal comma and says what to write", () => {
    expect(onlyIssue({ amount: "1,5" })).toMatchObject({
      column: "amount",
      message: "Use a dot as the decimal mark: write 1.5. Commas are not accepted because 1,500 can mean 1.5 or 1500.",
    });
    expect(onlyIssue({ amount: "1,500", capacity: "" , capacity_unit: ""}).message).toMatch(/write 1\.500 or 1500, whichever is meant/);
  });

  it("tells to put a unit written beside the amount in its own column", () => {
    expect(onlyIssue({ amount: "500 mL" }).message).toBe(
      "“500 mL” is not a number: give the number alone and put the unit in its own column.",
    );
  });

  it("reports an unknown amount unit", () => {
    expect(onlyIssue({ amount_unit: "oz" })).toEqual({
      line: 2,
      column: "amount_unit",
      value: "oz",
      message: "Unknown unit “oz”; use mL, L, g or kg.",
    });
  });

  it("understands units in any case and as words", () => {
    const table = containerTable([
      { amount_unit: "ml", amount: "100", capacity_unit: "Litre" },
      { amount_unit: "LITERS", amount: "1" },
      { amount_unit: "grams", amount: "10", capacity: "", capacity_unit: "" },
      { amount_unit: "KG", amount: "1", capacity: "", capacity_unit: "" },
    ]);
    const result = validateContainerRows(table, lookups);
    expect(result.issues).toEqual([]);
    expect(result.rows.map((r) => [r.amountUnit, r.capacityUnit])).toEqual([
      ["mL", "L"],
      ["L", "L"],
      ["g", null],
      ["kg", null],
    ]);
  });

  it("reports a capacity smaller than the amount in the same dimension", () => {
    expect(onlyIssue({ amount: "750", amount_unit: "mL", capacity: "0.5", capacity_unit: "L" })).toEqual({
      line: 2,
      column: "capacity",
      value: "0.5",
      message: "Capacity 0.5 L is smaller than the amount 750 mL; check both values and their units.",
    });
  });

  it("does not compare a mass with a volume", () => {
    expect(issuesFor({ amount: "900", amount_unit: "g", capacity: "500", capacity_unit: "mL" })).toEqual([]);
  });

  it("reports a capacity without its unit, and a unit without a capacity", () => {
    expect(onlyIssue({ capacity_unit: "" })).toMatchObject({ column: "capacity_unit", message: expect.stringMatching(/^Capacity unit is missing/) });
    expect(onlyIssue({ capacity: "" })).toMatchObject({
      column: "capacity",
      message: "A capacity unit (“L”) is given but no capacity; fill in both or neither.",
    });
  });

  it("reports a CAS number that is not shaped like one", () => {
    expect(onlyIssue({ cas: "67641-" })).toMatchObject({
      column: "cas",
      message: "“67641-” is not a CAS number; CAS numbers look like 67-64-1 (2–7 digits, 2 digits, 1 check digit).",
    });
  });

  it("reports a CAS number whose check digit is wrong and suggests the valid one", () => {
    expect(onlyIssue({ cas: "67-64-2" })).toEqual({
      line: 2,
      column: "cas",
      value: "67-64-2",
      message: "CAS number 67-64-2 is not valid: its check digit should be 1 — did you mean 67-64-1? Otherwise another digit is mistyped.",
    });
  });

  it("recognises a CAS number a spreadsheet turned into a date", () => {
    expect(onlyIssue({ cas: "2003-10-12" }).message).toMatch(/spreadsheet probably turned the CAS number into a date/);
  });

  it("reports a valid CAS number that is not in the library", () => {
    expect(onlyIssue({ cas: "110-54-3" })).toEqual({
      line: 2,
      column: "cas",
      value: "110-54-3",
      message: "CAS number 110-54-3 is not in the substance library. Add the substance first, or check the number.",
    });
  });

  it("finds a substance by name or synonym, in any case", () => {
    const result = validateContainerRows(
      containerTable([
        { cas: "", substance: "acetone" },
        { cas: "", substance: "  ETHYL   alcohol " },
      ]),
      lookups,
    );
    expect(result.issues).toEqual([]);
    expect(result.rows.map((r) => r.substanceId)).toEqual([2, 1]);
  });

  it("reports an unknown substance name", () => {
    expect(onlyIssue({ cas: "", substance: "Acetonne" })).toEqual({
      line: 2,
      column: "substance",
      value: "Acetonne",
      message:
        "No substance named “Acetonne” in the library (names and synonyms are searched). Check the spelling, give its CAS number instead, or add the substance first.",
    });
  });

  it("finds a mixture by name, and reports an unknown one", () => {
    const [row] = validateContainerRows(containerTable([{ cas: "", mixture: "solvent waste (halogen-free)" }]), lookups).rows;
    expect(row).toMatchObject({ substanceId: null, mixtureId: 10 });
    expect(onlyIssue({ cas: "", mixture: "Waste B" })).toMatchObject({
      column: "mixture",
      message: "No mixture named “Waste B”. Set the mixture up in Headroom first, or check the spelling.",
    });
  });

  it("reports a row that names both a substance and a mixture", () => {
    expect(onlyIssue({ cas: "64-17-5", mixture: "Solvent waste (halogen-free)" })).toEqual({
      line: 2,
      column: "mixture",
      value: "Solvent waste (halogen-free)",
      message:
        "Give only one of cas, substance or mixture; this row has cas “64-17-5” and mixture “Solvent waste (halogen-free)”.",
    });
  });

  it("reports a row that says nothing about its content", () => {
    expect(onlyIssue({ cas: "" })).toEqual({
      line: 2,
      column: "cas",
      value: "",
      message: "Say what the container holds: fill in one of cas, substance or mixture.",
    });
  });

  it("says which part of the location is unknown", () => {
    expect(onlyIssue({ site: "West Campus" })).toMatchObject({
      column: "site",
      message: "No site named “West Campus”. Check the spelling, or import the locations first.",
    });
    expect(onlyIssue({ room: "B-015" })).toMatchObject({
      column: "room",
      message: "No room B-015 at North Campus. Check the room code, or import the locations first.",
    });
    expect(onlyIssue({ storage_unit: "FC-9" })).toMatchObject({
      column: "storage_unit",
      message: "No storage unit FC-9 in room B-014 at North Campus. Check the unit code.",
    });
  });

  it("names the whole location when the lookups cannot tell which part is wrong", () => {
    expect(onlyIssue({ room: "B-015" }, basicLookups)).toMatchObject({
      column: "storage_unit",
      message: "No storage unit FC-1 in room B-015 at North Campus; check the site name, room code and unit code.",
    });
  });

  it("reports each missing part of the location", () => {
    const issues = issuesFor({ site: "", room: "", storage_unit: "" });
    expect(issues.map((i) => i.column)).toEqual(["site", "room", "storage_unit"]);
  });

  it("reports an unknown container kind and an unknown state, listing the accepted values", () => {
    expect(onlyIssue({ container_kind: "jar" })).toMatchObject({
      column: "container_kind",
      message: expect.stringMatching(/^Unknown container kind “jar”; use one of: glass_bottle, plastic_bottle, /),
    });
    expect(onlyIssue({ state: "half full" })).toMatchObject({
      column: "state",
      message: "Unknown state “half full”; use one of: sealed, opened, in_use, empty, disposed.",
    });
  });

  it("accepts kinds and states written in plain words", () => {
    const [row] = validateContainerRows(containerTable([{ container_kind: "Safety can", state: "In use" }]), lookups).rows;
    expect(row).toMatchObject({ containerKind: "safety_can", state: "in_use" });
  });

  it("reports a date that is not on the calendar", () => {
    expect(onlyIssue({ expires_on: "2026-02-30" })).toEqual({
      line: 2,
      column: "expires_on",
      value: "2026-02-30",
      message: "2026-02-30 is not a date on the calendar (check the month and day).",
    });
  });

  it("refuses a day-or-month-first date and shows both readings", () => {
    expect(onlyIssue({ expires_on: "03/04/2026" })).toMatchObject({
      column: "expires_on",
      message: "Write dates as YYYY-MM-DD: 03/04/2026 could be 2026-04-03 or 2026-03-04.",
    });
    expect(onlyIssue({ expires_on: "25/12/2026" }).message).toBe("Write dates as YYYY-MM-DD; did you mean 2026-12-25?");
  });

  it("explains a spreadsheet day number in a date column", () => {
    expect(onlyIssue({ expires_on: "46023" }).message).toBe(
      "46023 looks like a spreadsheet day number, not a date (it would be 2026-01-01). Format the column as a date, or write YYYY-MM-DD.",
    );
  });

  it("reports a container opened before it was received", () => {
    expect(onlyIssue({ received_on: "2026-03-01", opened_on: "2026-02-01" })).toEqual({
      line: 2,
      column: "opened_on",
      value: "2026-02-01",
      message: "Opened on 2026-02-01, before it was received on 2026-03-01; check both dates.",
    });
  });

  it("reports an owner e-mail that no user has, and one that is not an address", () => {
    expect(onlyIssue({ owner_email: "nobody@example.org" })).toMatchObject({
      column: "owner_email",
      message: "No Headroom user has the e-mail address nobody@example.org; invite them first or leave the cell empty.",
    });
    expect(onlyIssue({ owner_email: "r.okafor at example.org" }).message).toBe("“r.okafor at example.org” is not an e-mail address.");
  });

  it("matches owner e-mail addresses without regard to case", () => {
    const [row] = validateContainerRows(containerTable([{ owner_email: " R.Okafor@Example.org " }]), lookups).rows;
    expect(row.ownerId).toBe(7);
  });

  it("reports a label used again on the second and later lines, naming the first", () => {
    const table = containerTable([{ label: "HR-7" }, { label: "HR-8" }, { label: "HR-7" }, { label: "HR-7" }]);
    const result = validateContainerRows(table, lookups);
    expect(result.issues).toEqual([
      { line: 4, column: "label", value: "HR-7", message: "Label HR-7 is already used on line 2; each container needs its own label." },
      { line: 5, column: "label", value: "HR-7", message: "Label HR-7 is already used on line 2; each container needs its own label." },
    ]);
    expect(result.rows.map((r) => r.line)).toEqual([2, 3]);
  });

  it("reports every problem of a row, not just the first", () => {
    const issues = issuesFor({ cas: "67-64-2", amount: "-1", received_on: "03/04/2026" });
    expect(issues.map((i) => [i.line, i.column])).toEqual([
      [2, "cas"],
      [2, "amount"],
      [2, "received_on"],
    ]);
    expect(issues[1].message).toBe("Amount must be zero or more; got −1.");
  });

  it("finds the one bad row among a thousand", () => {
    const changes = Array.from({ length: 1000 }, (_, i): Record<string, string> => (i === 637 ? { amount_unit: "gallons" } : {}));
    const result = validateContainerRows(containerTable(changes), lookups);
    expect(result.rowCount).toBe(1000);
    expect(result.rows).toHaveLength(999);
    expect(result.issues).toEqual([
      { line: 639, column: "amount_unit", value: "gallons", message: "Unknown unit “gallons”; use mL, L, g or kg." },
    ]);
  });

  it("reports a row with more values than the header has columns", () => {
    const table = containerTable([{}]);
    table.rows[0].extraCells = ["keep cool"];
    expect(validateContainerRows(table, lookups).issues).toEqual([
      {
        line: 2,
        column: "notes",
        value: "keep cool",
        message:
          "This row has 19 values but the header names 18 columns (extra: “keep cool”). A value that contains the delimiter must be in double quotes.",
      },
    ]);
  });

  it("says where extra values sit in a workbook row", () => {
    const table = { ...containerTable([{}]), format: "xlsx" as const };
    table.rows[0].extraCells = ["", "stray"];
    expect(validateContainerRows(table, lookups).issues[0].message).toBe(
      "This row has values to the right of the last named column (extra: “stray”). Name their column or delete them.",
    );
  });

  it("refuses a file without the required columns, naming all of them", () => {
    const table = { format: "csv" as const, headers: ["label", "amout", "notes"], rows: [] };
    let error: unknown;
    try {
      validateContainerRows(table, lookups);
    } catch (e) {
      error = e;
    }
    expect(error).toBeInstanceOf(ImportFileError);
    expect((error as ImportFileError).code).toBe("missing_columns");
    expect((error as ImportFileError).message).toBe(
      "The container file is missing columns: amount (is “amout” meant to be amount?); amount_unit; site; room; storage_unit; " +
        "one of cas, substance or mixture. Download the template to see every column.",
    );
    expect((error as ImportFileError).columns).toEqual([
      "amount",
      "amount_unit",
      "site",
      "room",
      "storage_unit",
      "cas",
      "substance",
      "mixture",
    ]);
  });

  it("notes columns it does not use", () => {
    const table = containerTable([{}]);
    table.headers.push("colour");
    table.rows[0].cells.colour = "amber";
    const result = validateContainerRows(table, lookups);
    expect(result.issues).toEqual([]);
    expect(result.notices).toEqual(["Column “colour” is not used by container imports and was ignored."]);
  });
});
