import { describe, expect, it } from "vitest";
import {
  actionBodySchema,
  commentBodySchema,
  createRequestSchema,
  editRequestSchema,
  parseBody,
  parseJsonText,
} from "../../../lib/changes/schema";
import { DomainError, type IssueDetail } from "../../../lib/changes/errors";

function issues(schema: Parameters<typeof parseBody>[0], body: unknown): IssueDetail[] {
  try {
    parseBody(schema, body);
  } catch (error) {
    if (error instanceof DomainError && error.code === "invalid") return [...error.details];
    throw error;
  }
  throw new Error("expected the body to be refused");
}

const good = {
  title: "Tilt down the quay sector",
  reason: "Overshoot into the next cluster",
  items: [{ cellId: "C-101", parameter: "electricalTiltDeg", newValue: 6 }],
};

describe("parseBody(createRequestSchema, body)", () => {
  it("accepts a minimal request and trims text", () => {
    const parsed = parseBody(createRequestSchema, { ...good, title: "  Tilt  " });
    expect(parsed.title).toBe("Tilt");
    expect(parsed.items).toEqual(good.items);
  });

  it("turns window strings with a zone into Dates", () => {
    const parsed = parseBody(createRequestSchema, {
      ...good,
      windowStart: "2026-03-01T23:00:00+01:00",
      windowEnd: "2026-03-02T02:00:00Z",
    });
    expect(parsed.windowStart?.toISOString()).toBe("2026-03-01T22:00:00.000Z");
    expect(parsed.windowEnd?.toISOString()).toBe("2026-03-02T02:00:00.000Z");
  });

  it("names the path of every bad item field", () => {
    const found = issues(createRequestSchema, {
      ...good,
      items: [
        good.items[0],
        { cellId: "C-102", parameter: "heightM", newValue: 3 },
        { cellId: "C-103", parameter: "azimuthDeg", newValue: null },
        { cellId: "", parameter: "azimuthDeg", newValue: 3, newvalue: 4 },
      ],
    });
    expect(found.map((i) => i.path)).toEqual([
      "items[1].parameter",
      "items[2].newValue",
      "items[3].cellId",
      "items[3].newvalue",
    ]);
    expect(found[0].message).toContain("azimuthDeg");
    expect(found[3].message).toBe("unknown field");
  });

  it("refuses blank title and reason, no items, and a local time without zone", () => {
    const found = issues(createRequestSchema, {
      title: " ",
      reason: "",
      items: [],
      windowStart: "2026-03-01T22:00:00",
      windowEnd: "2026-03-01T23:00:00Z",
    });
    expect(found.map((i) => i.path).sort()).toEqual(["items", "reason", "title", "windowStart"]);
    expect(found.find((i) => i.path === "windowStart")?.message).toMatch(/time zone/);
  });

  it("refuses a window that ends before it starts, or has only one end", () => {
    expect(
      issues(createRequestSchema, { ...good, windowStart: "2026-03-02T00:00:00Z", windowEnd: "2026-03-01T00:00:00Z" }),
    ).toEqual([{ path: "windowEnd", message: "must be after windowStart" }]);
    expect(issues(createRequestSchema, { ...good, windowStart: "2026-03-02T00:00:00Z" })[0].path).toBe("windowEnd");
    expect(issues(editRequestSchema, { version: 2, windowEnd: "2026-03-02T00:00:00Z" })[0].path).toBe("windowStart");
  });

  it("refuses non-finite numbers and a body that is not an object", () => {
    expect(issues(createRequestSchema, { ...good, items: [{ ...good.items[0], newValue: Infinity }] })[0].path).toBe(
      "items[0].newValue",
    );
    expect(issues(createRequestSchema, "hello")).toEqual([{ path: "(body)", message: "the body must be a JSON object" }]);
  });

  it("throws one error whose message lists every path", () => {
    try {
      parseBody(createRequestSchema, { title: "", reason: "", items: [] });
      expect.unreachable();
    } catch (error) {
      expect((error as DomainError).message).toMatch(/title: .*reason: .*items: /);
    }
  });
});

describe("parseBody(editRequestSchema, body)", () => {
  it("requires a whole positive version", () => {
    expect(issues(editRequestSchema, { title: "x" }).map((i) => i.path)).toEqual(["version"]);
    expect(issues(editRequestSchema, { version: 1.5 })[0].path).toBe("version");
    expect(issues(editRequestSchema, { version: 0 })[0].path).toBe("version");
  });

  it("accepts a version alone, and null windows to clear them", () => {
    expect(parseBody(editRequestSchema, { version: 4 })).toEqual({ version: 4 });
    expect(parseBody(editRequestSchema, { version: 4, windowStart: null, windowEnd: null })).toEqual({
      version: 4,
      windowStart: null,
      windowEnd: null,
    });
  });
});

describe("parseBody(actionBodySchema, body)", () => {
  it("requires a non-blank comment for reject and return, not for approve", () => {
    for (const action of ["reject", "return"]) {
      expect(issues(actionBodySchema, { action, version: 2, comment: "   " })).toEqual([
        { path: "comment", message: `a comment is required to ${action}` },
      ]);
      expect(issues(actionBodySchema, { action, version: 2 })[0].path).toBe("comment");
    }
    expect(parseBody(actionBodySchema, { action: "approve", version: 2 })).toEqual({ action: "approve", version: 2 });
  });

  it("refuses actions a person cannot post (system and edit)", () => {
    for (const action of ["simulation_finished", "edit", "delete"]) {
      expect(issues(actionBodySchema, { action, version: 1 })[0].path).toBe("action");
    }
  });
});

describe("parseBody(commentBodySchema, body)", () => {
  it("trims and refuses blank text", () => {
    expect(parseBody(commentBodySchema, { text: "  ok  " })).toEqual({ text: "ok" });
    expect(issues(commentBodySchema, { text: " \t " })[0].path).toBe("text");
  });
});

describe("parseJsonText(text)", () => {
  it("throws bad_request on malformed JSON", () => {
    expect(parseJsonText('{"a":1}')).toEqual({ a: 1 });
    try {
      parseJsonText("{a:");
      expect.unreachable();
    } catch (error) {
      expect((error as DomainError).code).toBe("bad_request");
    }
  });
});
