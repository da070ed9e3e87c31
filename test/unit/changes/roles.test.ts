import { describe, expect, it } from "vitest";
import { PERMISSIONS, ROLES, ROLE_LABELS, can, isRole, permissionsOf, type Permission, type Role } from "../../../lib/changes/roles";

// The matrix written out independently: who holds each permission.
const HOLDERS: Record<Permission, Role[]> = {
  "request.read": ["engineer", "owner", "field", "viewer", "admin"],
  "request.create": ["engineer"],
  "request.edit": ["engineer"],
  "request.submit": ["engineer"],
  "request.preview": ["engineer"],
  "request.rebase": ["engineer"],
  "request.comment": ["engineer", "owner", "field"],
  "request.approve": ["owner"],
  "request.reject": ["owner"],
  "request.return": ["owner"],
  "request.implement": ["field"],
  "request.rollback": ["field"],
  "workorder.read": ["engineer", "owner", "field", "viewer", "admin"],
  "network.read": ["engineer", "owner", "field", "viewer", "admin"],
  "network.import": ["admin"],
  "audit.read": ["engineer", "owner", "field", "viewer", "admin"],
  "audit.verify": ["owner", "admin"],
  "users.manage": ["admin"],
  "settings.manage": ["admin"],
};

describe("can(role, permission)", () => {
  for (const permission of PERMISSIONS) {
    for (const role of ROLES) {
      const expected = HOLDERS[permission].includes(role);
      it(`can("${role}", "${permission}") is ${expected}`, () => {
        expect(can(role, permission)).toBe(expected);
      });
    }
  }

  it("refuses an admin every decision on a request (approval is the owner's)", () => {
    for (const p of ["request.approve", "request.reject", "request.return", "request.create"] as const) {
      expect(can("admin", p)).toBe(false);
    }
  });

  it("refuses unknown, empty and missing roles everything", () => {
    for (const role of ["root", "", null, undefined, "Owner"]) {
      for (const p of PERMISSIONS) expect(can(role, p)).toBe(false);
    }
  });
});

describe("roles", () => {
  it("isRole(value) accepts exactly the five roles", () => {
    expect(ROLES.filter(isRole)).toEqual(["engineer", "owner", "field", "viewer", "admin"]);
    expect(isRole("system")).toBe(false);
    expect(isRole(3)).toBe(false);
  });

  it("permissionsOf(viewer) is read-only", () => {
    expect(permissionsOf("viewer")).toEqual(["request.read", "workorder.read", "network.read", "audit.read"]);
  });

  it("every role has a label", () => {
    for (const role of ROLES) expect(ROLE_LABELS[role].length).toBeGreaterThan(3);
  });
});
