// Every API route checks the session and the role: each role gets exactly what it may, a
// visitor without a session gets 401, a role without the permission 403. The expectations
// are written out by hand (not derived from the permission table) so that a wrong table
// fails here.
import { expect, test } from "@playwright/test";
import { apiAs } from "./api-client";
import { userOf } from "./support";

type Role = "engineer" | "owner" | "field" | "viewer" | "admin";
const ROLES: Role[] = ["engineer", "owner", "field", "viewer", "admin"];

interface Probe {
  name: string;
  method: "GET" | "POST" | "PATCH" | "PUT";
  path: (ids: { request: string; cell: string; user: string }) => string;
  body?: unknown;
  /** Roles that pass the gate; every other role must get 403. */
  allowed: Role[];
}

const everyone: Role[] = [...ROLES];
const probes: Probe[] = [
  { name: "list requests", method: "GET", path: () => "/api/requests", allowed: everyone },
  { name: "read a request", method: "GET", path: (i) => `/api/requests/${i.request}`, allowed: everyone },
  { name: "create a request", method: "POST", path: () => "/api/requests", body: { title: "probe", reason: "role matrix", items: [] }, allowed: ["engineer"] },
  { name: "edit a request", method: "PATCH", path: (i) => `/api/requests/${i.request}`, body: { version: 999 }, allowed: ["engineer"] },
  { name: "comment", method: "POST", path: (i) => `/api/requests/${i.request}/comments`, body: { text: "probe" }, allowed: ["engineer", "owner", "field"] },
  { name: "preview", method: "POST", path: (i) => `/api/requests/${i.request}/preview`, allowed: ["engineer"] },
  { name: "approve", method: "POST", path: (i) => `/api/requests/${i.request}/actions`, body: { action: "approve", version: 999 }, allowed: ["owner"] },
  { name: "implement", method: "POST", path: (i) => `/api/requests/${i.request}/actions`, body: { action: "implement", version: 999 }, allowed: ["field"] },
  { name: "network", method: "GET", path: () => "/api/network", allowed: everyone },
  { name: "cells", method: "GET", path: () => "/api/network/cells", allowed: everyone },
  { name: "cell history", method: "GET", path: (i) => `/api/network/cells/${i.cell}/history`, allowed: everyone },
  { name: "versions", method: "GET", path: () => "/api/network/versions", allowed: everyone },
  { name: "audit log", method: "GET", path: () => "/api/audit", allowed: everyone },
  { name: "verify audit chain", method: "POST", path: () => "/api/audit/verify", allowed: ["owner", "admin"] },
  { name: "list users", method: "GET", path: () => "/api/admin/users", allowed: ["admin"] },
  { name: "create user", method: "POST", path: () => "/api/admin/users", body: { email: "x", name: "", role: "viewer", password: "short" }, allowed: ["admin"] },
  { name: "change user", method: "PATCH", path: (i) => `/api/admin/users/${i.user}`, body: { name: "" }, allowed: ["admin"] },
  { name: "read KPI settings", method: "GET", path: () => "/api/admin/settings", allowed: ["admin"] },
  { name: "change KPI settings", method: "PUT", path: () => "/api/admin/settings", body: { coverageThresholdDbm: 5 }, allowed: ["admin"] },
];

test("the role matrix: 401 without a session, 403 for a role without the permission, through for the rest", async ({ baseURL }) => {
  const engineer = await apiAs(baseURL!, userOf("engineer"));
  const cells = (await (await engineer.get("/api/network/cells")).json()).cells as { code: string; electricalTiltDeg: number }[];
  const cell = cells[0];
  const created = await engineer.post("/api/requests", {
    data: { title: "Matrix probe", reason: "role matrix test", items: [{ cellId: cell.code, parameter: "electricalTiltDeg", newValue: cell.electricalTiltDeg === 6 ? 7 : 6 }] },
  });
  expect(created.status()).toBe(201);
  const requestId = (await created.json()).id as string;
  const admin = await apiAs(baseURL!, userOf("admin"));
  const users = (await (await admin.get("/api/admin/users")).json()).users as { id: string; role: string }[];
  const ids = { request: requestId, cell: cell.code, user: users.find((u) => u.role === "viewer")!.id };

  const contexts = new Map<Role | "nobody", Awaited<ReturnType<typeof apiAs>>>();
  contexts.set("nobody", await apiAs(baseURL!, null));
  for (const role of ROLES) contexts.set(role, role === "engineer" ? engineer : role === "admin" ? admin : await apiAs(baseURL!, userOf(role)));

  const seen: string[] = [];
  for (const probe of probes) {
    for (const [who, context] of contexts) {
      const response = await context.fetch(probe.path(ids), { method: probe.method, ...(probe.body !== undefined ? { data: probe.body } : {}) });
      const status = response.status();
      seen.push(`${probe.name} as ${who}: ${status}`);
      if (who === "nobody") expect(status, `${probe.name} without a session`).toBe(401);
      else if (probe.allowed.includes(who)) expect([401, 403], `${probe.name} as ${who} must pass the gate (got ${status})`).not.toContain(status);
      else expect(status, `${probe.name} as ${who}`).toBe(403);
    }
  }
  // Gated answers are real answers: a malformed body that passes the gate is named, not served.
  const bad = await admin.post("/api/admin/users", { data: { email: "x", name: "", role: "viewer", password: "short" } });
  expect(bad.status()).toBe(422);
  expect(JSON.stringify(await bad.json())).toContain("email");
  expect(seen.length).toBe(probes.length * 6);
});
