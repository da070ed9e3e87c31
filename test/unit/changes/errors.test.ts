import { describe, expect, it } from "vitest";
import {
  DOMAIN_ERROR_CODES,
  DomainError,
  errorBody,
  formatPath,
  httpStatusOf,
  invalid,
  isDomainError,
} from "../../../lib/changes/errors";

describe("httpStatusOf(code)", () => {
  it("maps each code to its status", () => {
    const expected = {
      unauthenticated: 401,
      forbidden: 403,
      four_eyes: 403,
      not_found: 404,
      bad_request: 400,
      invalid: 422,
      illegal_transition: 409,
      stale: 409,
      simulation_required: 409,
      conflict: 409,
    };
    expect(Object.fromEntries(DOMAIN_ERROR_CODES.map((c) => [c, httpStatusOf(c)]))).toEqual(expected);
  });
});

describe("DomainError", () => {
  it("carries code, field, details and context and is an Error", () => {
    const error = new DomainError("invalid", "bad", {
      field: "title",
      details: [{ path: "title", message: "empty" }],
      context: { state: "draft" },
    });
    expect(error).toBeInstanceOf(Error);
    expect(isDomainError(error)).toBe(true);
    expect(isDomainError(new Error("x"))).toBe(false);
    expect(error.name).toBe("DomainError");
    expect(errorBody(error)).toEqual({
      error: {
        code: "invalid",
        message: "bad",
        field: "title",
        details: [{ path: "title", message: "empty" }],
        context: { state: "draft" },
      },
    });
  });

  it("errorBody omits field when there is none", () => {
    expect("field" in errorBody(new DomainError("not_found", "no such request")).error).toBe(false);
  });
});

describe("formatPath(path) and invalid(details)", () => {
  it("formatPath writes array indices in brackets", () => {
    expect(formatPath(["items", 2, "newValue"])).toBe("items[2].newValue");
    expect(formatPath([0, "a"])).toBe("[0].a");
    expect(formatPath([])).toBe("(body)");
  });

  it("invalid(details) lists every issue in the message and sets field only for one", () => {
    const many = invalid([
      { path: "a", message: "x" },
      { path: "b", message: "y" },
    ]);
    expect(many.code).toBe("invalid");
    expect(many.message).toBe("invalid input: a: x; b: y");
    expect(many.field).toBeUndefined();
    expect(invalid([{ path: "a", message: "x" }]).field).toBe("a");
  });
});
