import { describe, expect, it } from "vitest";
import { CELL_HEADER_ALIASES, decodeUtf8, normaliseImportHeader, resolveHeader } from "../../../lib/io/importTable";

describe("normaliseImportHeader(name)", () => {
  it("reads case, spaces, hyphens, brackets, camelCase and unit spellings alike", () => {
    for (const h of ["azimuth_deg", "Azimuth (deg)", "AZIMUTH_DEG", "azimuth-deg", " azimuthDeg ", "Azimuth [deg]"]) {
      expect(normaliseImportHeader(h)).toBe("azimuth_deg");
    }
    expect(normaliseImportHeader("RS Power (dBm)")).toBe("rs_power_dbm");
    expect(normaliseImportHeader("rsPowerDbm")).toBe("rs_power_dbm");
    expect(normaliseImportHeader("SCS (kHz)")).toBe("scs_khz");
    expect(normaliseImportHeader("subcarrierSpacingKHz")).toBe("subcarrier_spacing_khz");
    expect(normaliseImportHeader("building:levels")).toBe("building_levels");
  });
});

describe("resolveHeader(header, aliases)", () => {
  it("maps every documented alias to its column and nothing else", () => {
    for (const [column, names] of Object.entries(CELL_HEADER_ALIASES)) {
      for (const n of names) expect(resolveHeader(n, CELL_HEADER_ALIASES)).toBe(column);
    }
    expect(resolveHeader("tilt", CELL_HEADER_ALIASES)).toBeUndefined();
  });
});

describe("decodeUtf8(bytes, file)", () => {
  it("drops a UTF-8 byte-order mark", () => {
    expect(decodeUtf8(new Uint8Array([0xef, 0xbb, 0xbf, 0x61]), "f.csv")).toEqual({ text: "a" });
  });

  it("refuses UTF-16 (with or without a mark) and invalid UTF-8 with the line", () => {
    expect(decodeUtf8(new Uint8Array([0xfe, 0xff, 0, 0x61]), "f.csv").problem?.reason).toMatch(/UTF-16 \(big-endian/);
    expect(decodeUtf8(new Uint8Array([0x61, 0, 0x62, 0]), "f.csv").problem?.reason).toMatch(/NUL bytes/);
    const bad = decodeUtf8(new Uint8Array([0x61, 0x0a, 0x62, 0x0a, 0xff]), "f.csv").problem;
    expect(bad).toMatchObject({ severity: "error", file: "f.csv", row: 3 });
  });
});
