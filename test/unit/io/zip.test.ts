import { describe, expect, it } from "vitest";
import { declaredUncompressedSize, looksLikeZip, readZipDirectory, unzipEntries, ZipError } from "../../../lib/io/zip";
import { buildZip } from "../../support/zipBuilder";

const enc = (s: string): Uint8Array => new TextEncoder().encode(s);

describe("readZipDirectory(bytes)", () => {
  it("lists the entries with their declared sizes without inflating", () => {
    const zip = buildZip([
      { name: "a.csv", bytes: enc("x".repeat(1000)) },
      { name: "dir/b.json", bytes: enc("[]"), declaredSize: 123_456_789 },
    ]);
    expect(looksLikeZip(zip)).toBe(true);
    const entries = readZipDirectory(zip);
    expect(entries.map((e) => [e.name, e.uncompressedSize])).toEqual([
      ["a.csv", 1000],
      ["dir/b.json", 123_456_789],
    ]);
    expect(entries[0].compressedSize).toBeLessThan(100);
    expect(declaredUncompressedSize(entries)).toBe(123_457_789);
  });

  it("refuses bytes without an end-of-central-directory record", () => {
    expect(() => readZipDirectory(enc("PK\u0003\u0004 not really"))).toThrow(ZipError);
  });
});

describe("unzipEntries(bytes, maxBytes)", () => {
  it("gives back every file's bytes", () => {
    const zip = buildZip([{ name: "a.csv", bytes: enc("id\n1\n") }, { name: "b.txt", bytes: enc("hello") }]);
    const out = unzipEntries(zip, 1000);
    expect(out.map((e) => [e.name, new TextDecoder().decode(e.bytes)])).toEqual([
      ["a.csv", "id\n1\n"],
      ["b.txt", "hello"],
    ]);
  });

  it("stops at maxBytes of inflated data even when the directory claims less", () => {
    const zip = buildZip([{ name: "big.csv", bytes: new Uint8Array(50_000), declaredSize: 1 }]);
    expect(() => unzipEntries(zip, 10_000)).toThrow(/inflates to more than 10000 bytes/);
  });
});
