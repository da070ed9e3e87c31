import { describe, expect, it } from "vitest";
import {
  SAFETY_NOTICE,
  WORK_ORDER_CSV_HEADER,
  buildWorkOrder,
  csvField,
  formatCsv,
  workOrderCsv,
  workOrderJson,
  type WorkOrderSource,
} from "../../../lib/changes/workOrder";
import { DomainError } from "../../../lib/changes/errors";

const source: WorkOrderSource = {
  id: "cr-7",
  title: 'Quay sector: "tilt down", widen beam',
  state: "approved",
  approvedBy: "Owner One",
  approvedAt: new Date("2026-02-27T10:00:00Z"),
  windowStart: "2026-03-01T23:00:00+01:00",
  windowEnd: new Date("2026-03-02T02:00:00Z"),
  items: [
    { cellId: "C1", parameter: "electricalTiltDeg", oldValue: 4, newValue: 7 },
    { cellId: "C1", parameter: "beamSetId", oldValue: "wide", newValue: "sweep" },
    { cellId: "C2", parameter: "rsPowerDbm", oldValue: 15, newValue: -3 },
  ],
};

describe("buildWorkOrder(source)", () => {
  it("lists each item as a step from the old value to the new one", () => {
    const order = buildWorkOrder(source);
    expect(order.rows.map((r) => [r.step, r.cellId, r.parameterLabel, r.fromValue, r.toValue])).toEqual([
      [1, "C1", "Electrical tilt (°)", 4, 7],
      [2, "C1", "Beam set", "wide", "sweep"],
      [3, "C2", "RS power (dBm)", 15, -3],
    ]);
    expect(order.windowStart).toBe("2026-03-01T22:00:00.000Z");
    expect(order.windowEnd).toBe("2026-03-02T02:00:00.000Z");
    expect(order.approvedAt).toBe("2026-02-27T10:00:00.000Z");
    expect(order.notice).toBe(SAFETY_NOTICE);
  });

  it("builds rollback rows in reverse order with the values swapped", () => {
    const order = buildWorkOrder(source);
    expect(order.rollbackRows.map((r) => [r.step, r.cellId, r.parameter, r.fromValue, r.toValue])).toEqual([
      [1, "C2", "rsPowerDbm", -3, 15],
      [2, "C1", "beamSetId", "sweep", "wide"],
      [3, "C1", "electricalTiltDeg", 7, 4],
    ]);
  });

  it("also builds for an implemented request, and leaves missing dates null", () => {
    const order = buildWorkOrder({ ...source, state: "implemented", approvedAt: null, windowStart: undefined, windowEnd: null });
    expect([order.approvedAt, order.windowStart, order.windowEnd]).toEqual([null, null, null]);
  });

  it("refuses a request that is not approved", () => {
    for (const state of ["draft", "simulated", "rejected", "rolled_back"] as const) {
      expect(() => buildWorkOrder({ ...source, state })).toThrow(DomainError);
    }
  });

  it("refuses an unreadable date, naming the field", () => {
    expect(() => buildWorkOrder({ ...source, windowStart: "tonight" })).toThrow(/windowStart "tonight"/);
  });
});

describe("csvField(value)", () => {
  // RFC 4180 §2 rules 5–7: fields with comma, quote or line break are quoted; quotes doubled.
  it("quotes commas, quotes and line breaks, and doubles inner quotes", () => {
    expect(csvField("plain")).toBe("plain");
    expect(csvField("a,b")).toBe('"a,b"');
    expect(csvField('b"bb')).toBe('"b""bb"');
    expect(csvField("b\r\nbb")).toBe('"b\r\nbb"');
    expect(csvField("line\nbreak")).toBe('"line\nbreak"');
    expect(csvField(null)).toBe("");
    expect(csvField(-3.5)).toBe("-3.5");
  });

  it("defuses text a spreadsheet would run as a formula, but not plain numbers as text", () => {
    expect(csvField("=HYPERLINK(1)")).toBe("'=HYPERLINK(1)");
    expect(csvField("@cmd")).toBe("'@cmd");
    expect(csvField("+1,2")).toBe(`"'+1,2"`);
    expect(csvField("-3")).toBe("-3");
    expect(csvField("-1.5e3")).toBe("-1.5e3");
  });

  it("refuses non-finite numbers", () => {
    expect(() => csvField(NaN)).toThrow(RangeError);
  });
});

describe("formatCsv(header, rows)", () => {
  it("matches the RFC 4180 §2 rule 7 example and ends every record with CRLF", () => {
    expect(formatCsv(["x", "y", "z"], [["aaa", 'b"bb', "ccc"]])).toBe('x,y,z\r\naaa,"b""bb",ccc\r\n');
  });

  it("refuses a row of the wrong width", () => {
    expect(() => formatCsv(["a", "b"], [["1"]])).toThrow(/row 1 has 1 fields, the header 2/);
  });
});

describe("workOrderCsv(order, sheet)", () => {
  it("writes the header and one quoted-where-needed line per step", () => {
    const lines = workOrderCsv(buildWorkOrder(source)).split("\r\n");
    expect(lines[0]).toBe(WORK_ORDER_CSV_HEADER.join(","));
    expect(lines[1]).toBe(
      'cr-7,"Quay sector: ""tilt down"", widen beam",1,C1,Electrical tilt (°),4,7,2026-03-01T22:00:00.000Z,2026-03-02T02:00:00.000Z,Owner One',
    );
    expect(lines[3]).toContain(",3,C2,RS power (dBm),15,-3,");
    expect(lines).toHaveLength(5); // header, three steps, and the empty string after the final CRLF
    expect(lines[4]).toBe("");
  });

  it("writes the rollback sheet from new back to old", () => {
    const lines = workOrderCsv(buildWorkOrder(source), "rollback").split("\r\n");
    expect(lines[1]).toContain(",1,C2,RS power (dBm),-3,15,");
    expect(lines[3]).toContain(",3,C1,Electrical tilt (°),7,4,");
  });
});

describe("workOrderJson(order)", () => {
  it("round-trips to the same work order, notice and rollback included", () => {
    const order = buildWorkOrder(source);
    expect(JSON.parse(workOrderJson(order))).toEqual(order);
  });
});
