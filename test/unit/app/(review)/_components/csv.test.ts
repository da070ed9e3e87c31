import { describe, expect, it } from "vitest";
import { csvField, toCsv } from "../../../../../app/(review)/_components/csv";

describe("toCsv(header, rows)", () => {
  it("toCsv quotes fields with commas, quotes and line breaks (RFC 4180 §2) and ends records with CRLF", () => {
    const text = toCsv(["Number", "Title"], [[7, 'Tilt "north" sector, phase 2'], [8, "two\nlines"], [9, null]]);
    expect(text).toBe('Number,Title\r\n7,"Tilt ""north"" sector, phase 2"\r\n8,"two\nlines"\r\n9,\r\n');
  });

  it("csvField defuses text that a spreadsheet would run as a formula, but not numbers", () => {
    expect(csvField("=SUM(A1)")).toBe("'=SUM(A1)");
    expect(csvField("@cmd")).toBe("'@cmd");
    expect(csvField("-3 dB, west")).toBe("\"'-3 dB, west\"");
    expect(csvField(-3)).toBe("-3");
    expect(csvField("plain")).toBe("plain");
  });
});
