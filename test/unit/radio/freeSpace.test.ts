import { describe, expect, it } from "vitest";
import { freeSpaceLossDb } from "../../../lib/radio/freeSpace";

describe("freeSpaceLossDb", () => {
  it("freeSpaceLossDb(f, d) refuses non-positive frequency or distance with a RangeError naming the value", () => {
    expect(() => freeSpaceLossDb(0, 1)).toThrow(/frequencyMHz.*0/);
    expect(() => freeSpaceLossDb(900, -1)).toThrow(RangeError);
  });
});
