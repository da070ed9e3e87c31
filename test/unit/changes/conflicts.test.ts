import { describe, expect, it } from "vitest";
import { conflictPairs, conflictsOf, staleAfter, type RequestRef } from "../../../lib/changes/conflicts";

const open: RequestRef[] = [
  { id: "cr-a", state: "draft", cellIds: ["C1", "C2"], baseVersion: 3 },
  { id: "cr-b", state: "simulated", cellIds: ["C2", "C3", "C2"], baseVersion: 3 },
  { id: "cr-c", state: "submitted", cellIds: ["C4"], baseVersion: 3 },
  { id: "cr-d", state: "returned", cellIds: ["C1"], baseVersion: 2 },
  { id: "cr-e", state: "approved", cellIds: ["C3"], baseVersion: 3 },
  { id: "cr-f", state: "implemented", cellIds: ["C1", "C4"], baseVersion: 1 },
  { id: "cr-g", state: "rejected", cellIds: ["C1"], baseVersion: 1 },
  { id: "cr-h", state: "simulated", cellIds: ["C1"], baseVersion: 3, stale: true },
];

describe("staleAfter(trigger, requests)", () => {
  it("marks the undecided requests sharing a cell with an approved request", () => {
    const marks = staleAfter({ id: "cr-x", kind: "approved", cellIds: ["C1", "C3"] }, open);
    expect(marks.map((m) => [m.id, m.cellIds])).toEqual([
      ["cr-a", ["C1"]],
      ["cr-b", ["C3"]],
      ["cr-d", ["C1"]],
    ]);
    expect(marks[0].reason).toBe("request cr-x was approved and also changes cell C1");
  });

  it("skips the trigger itself, decided requests and those already stale", () => {
    const marks = staleAfter({ id: "cr-a", kind: "approved", cellIds: ["C1", "C2"] }, open);
    // cr-a is the trigger, cr-f implemented, cr-g rejected, cr-h already stale.
    expect(marks.map((m) => m.id)).toEqual(["cr-b", "cr-d"]);
  });

  it("spares requests already built on the new network version", () => {
    const requests: RequestRef[] = [
      { id: "old", state: "draft", cellIds: ["C1"], baseVersion: 4 },
      { id: "new", state: "draft", cellIds: ["C1"], baseVersion: 5 },
    ];
    const marks = staleAfter({ id: "t", kind: "implemented", cellIds: ["C1"], newVersion: 5 }, requests);
    expect(marks.map((m) => m.id)).toEqual(["old"]);
    expect(marks[0].reason).toContain("was implemented");
  });

  it("returns nothing when no cell is shared", () => {
    expect(staleAfter({ id: "t", kind: "rolled_back", cellIds: ["C9"] }, open)).toEqual([]);
  });

  it("shortens the reason after five cells", () => {
    const cells = ["C1", "C2", "C3", "C4", "C5", "C6", "C7"];
    const [mark] = staleAfter({ id: "t", kind: "approved", cellIds: cells }, [
      { id: "r", state: "draft", cellIds: cells, baseVersion: 1 },
    ]);
    expect(mark.reason).toBe("request t was approved and also changes cells C1, C2, C3, C4, C5 and 2 more");
  });
});

describe("conflictPairs(requests)", () => {
  it("pairs every two claiming requests that share a cell, once, with the shared cells", () => {
    expect(conflictPairs(open)).toEqual([
      { a: "cr-a", b: "cr-b", cellIds: ["C2"] },
      { a: "cr-a", b: "cr-d", cellIds: ["C1"] },
      { a: "cr-a", b: "cr-h", cellIds: ["C1"] },
      { a: "cr-b", b: "cr-e", cellIds: ["C3"] },
      { a: "cr-d", b: "cr-h", cellIds: ["C1"] },
    ]);
  });

  it("lists all shared cells of a pair, sorted", () => {
    expect(
      conflictPairs([
        { id: "y", state: "draft", cellIds: ["C9", "C2", "C5"], baseVersion: 1 },
        { id: "x", state: "draft", cellIds: ["C5", "C9"], baseVersion: 1 },
      ]),
    ).toEqual([{ a: "x", b: "y", cellIds: ["C5", "C9"] }]);
  });

  it("is empty for one request or none", () => {
    expect(conflictPairs([])).toEqual([]);
    expect(conflictPairs([open[0]])).toEqual([]);
  });
});

describe("conflictsOf(id, requests)", () => {
  it("names the other side of each conflict (flagged on both)", () => {
    expect(conflictsOf("cr-d", open)).toEqual([
      { otherId: "cr-a", cellIds: ["C1"] },
      { otherId: "cr-h", cellIds: ["C1"] },
    ]);
    expect(conflictsOf("cr-a", open).map((c) => c.otherId)).toContain("cr-d");
    expect(conflictsOf("cr-f", open)).toEqual([]);
  });
});
