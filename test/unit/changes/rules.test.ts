import { describe, expect, it } from "vitest";
import {
  REQUEST_ACTIONS,
  REQUEST_STATES,
  STATE_LABELS,
  ACTION_LABELS,
  SYSTEM_ACTOR,
  availableActions,
  assertCan,
  isEditableState,
  transition,
  type Actor,
  type RequestAction,
  type RequestSnapshot,
  type RequestState,
} from "../../../lib/changes/rules";
import { ROLES, type Role } from "../../../lib/changes/roles";
import { DomainError } from "../../../lib/changes/errors";

// The expected table, written out independently of lib/changes/rules.ts:
// [action, from, to, who may act, author rule].
type Who = Role | "system";
const LEGAL: [RequestAction, RequestState, RequestState, Who, "author" | "not_author" | "anyone"][] = [
  ["submit", "draft", "submitted", "engineer", "author"],
  ["edit", "draft", "draft", "engineer", "author"],
  ["edit", "returned", "draft", "engineer", "author"],
  ["withdraw", "submitted", "draft", "engineer", "author"],
  ["withdraw", "simulated", "draft", "engineer", "author"],
  ["rebase", "draft", "draft", "engineer", "author"],
  ["rebase", "submitted", "submitted", "engineer", "author"],
  ["rebase", "simulated", "submitted", "engineer", "author"],
  ["rebase", "returned", "draft", "engineer", "author"],
  ["simulation_finished", "submitted", "simulated", "system", "anyone"],
  ["simulation_failed", "submitted", "submitted", "system", "anyone"],
  ["approve", "simulated", "approved", "owner", "not_author"],
  ["reject", "simulated", "rejected", "owner", "not_author"],
  ["return", "simulated", "returned", "owner", "not_author"],
  ["implement", "approved", "implemented", "field", "anyone"],
  ["rollback", "implemented", "rolled_back", "field", "anyone"],
];

function snapshot(state: RequestState, authorId: string, over: Partial<RequestSnapshot> = {}): RequestSnapshot {
  // A healthy request: fresh, and its current revision simulated.
  return { id: "cr-1", state, authorId, revision: 3, simulatedRevision: 3, stale: false, version: 7, ...over };
}

function thrown(fn: () => unknown): DomainError {
  try {
    fn();
  } catch (error) {
    if (error instanceof DomainError) return error;
    throw error;
  }
  throw new Error("expected a DomainError, nothing was thrown");
}

const WHOS: Who[] = [...ROLES, "system"];
const INPUT = { comment: "needs a narrower beam", simulatedRevision: 3, error: "worker crashed" };

describe("transition(request, action, actor) over every state × action × role × authorship", () => {
  for (const state of REQUEST_STATES) {
    for (const action of REQUEST_ACTIONS) {
      for (const who of WHOS) {
        for (const asAuthor of [true, false]) {
          const actor: Actor = who === "system" ? SYSTEM_ACTOR : { id: `user-${who}`, role: who };
          const request = snapshot(state, asAuthor ? actor.id : "someone-else");
          const rowsOfAction = LEGAL.filter((r) => r[0] === action);
          const row = rowsOfAction.find((r) => r[1] === state);
          const roleFits = rowsOfAction[0][3] === who;
          let expected: RequestState | "forbidden" | "illegal_transition" | "four_eyes";
          if (!roleFits) expected = "forbidden";
          else if (row === undefined) expected = "illegal_transition";
          else if (row[4] === "author" && !asAuthor) expected = "forbidden";
          else if (row[4] === "not_author" && asAuthor) expected = "four_eyes";
          else expected = row[2];

          const title = `${action} from ${state} by ${who}${asAuthor ? " (author)" : ""} → ${expected}`;
          it(title, () => {
            if (REQUEST_STATES.includes(expected as RequestState)) {
              const result = transition(request, action, actor, INPUT);
              expect(result.ok).toBe(true);
              expect(result.to).toBe(expected);
              expect(result.patch.state).toBe(expected);
              expect(result.patch.version).toBe(8);
              expect(result.event.from).toBe(state);
              expect(result.event.to).toBe(expected);
              expect(result.event.actorId).toBe(actor.id);
            } else {
              const error = thrown(() => transition(request, action, actor, INPUT));
              expect(error.code).toBe(expected);
              // Messages name the action; state refusals also name the current state.
              expect(error.message).toContain(action);
              if (expected === "illegal_transition") expect(error.message).toContain(`"${state}"`);
            }
          });
        }
      }
    }
  }
});

describe("transition preconditions", () => {
  const owner: Actor = { id: "owner-1", role: "owner" };
  const engineer: Actor = { id: "eng-1", role: "engineer" };

  it("approve refuses the author even when the author holds the owner role (four-eyes)", () => {
    const error = thrown(() => transition(snapshot("simulated", "owner-1"), "approve", owner));
    expect(error.code).toBe("four_eyes");
    expect(error.message).toMatch(/four-eyes/);
  });

  it("approve refuses a stale request with code stale", () => {
    const error = thrown(() => transition(snapshot("simulated", "eng-1", { stale: true }), "approve", owner));
    expect(error.code).toBe("stale");
    expect(error.message).toMatch(/rebase/);
  });

  it("approve refuses when the simulated revision is not the current one", () => {
    const error = thrown(() =>
      transition(snapshot("simulated", "eng-1", { revision: 4, simulatedRevision: 3 }), "approve", owner),
    );
    expect(error.code).toBe("simulation_required");
    expect(error.message).toContain("revision 4");
    expect(error.message).toContain("revision 3");
  });

  it("approve refuses when no simulation finished at all", () => {
    const error = thrown(() => transition(snapshot("simulated", "eng-1", { simulatedRevision: null }), "approve", owner));
    expect(error.code).toBe("simulation_required");
    expect(error.message).toContain("none");
  });

  it("approve records the approver in the patch", () => {
    const result = transition(snapshot("simulated", "eng-1"), "approve", owner, { expectedVersion: 7 });
    expect(result.patch).toEqual({ state: "approved", version: 8, approverId: "owner-1" });
    expect(result.event.type).toBe("request.approved");
  });

  it("reject and return refuse an empty or blank comment with invalid on field comment", () => {
    for (const action of ["reject", "return"] as const) {
      for (const comment of [undefined, "", "   \n"]) {
        const error = thrown(() => transition(snapshot("simulated", "eng-1"), action, owner, { comment }));
        expect(error.code).toBe("invalid");
        expect(error.field).toBe("comment");
      }
    }
  });

  it("reject is allowed on a stale request and keeps the trimmed comment", () => {
    const result = transition(snapshot("simulated", "eng-1", { stale: true }), "reject", owner, {
      comment: "  overlaps the harbour works  ",
    });
    expect(result.to).toBe("rejected");
    expect(result.event.comment).toBe("overlaps the harbour works");
  });

  it("a version other than the one read loses with conflict, before any state check", () => {
    const error = thrown(() => transition(snapshot("approved", "eng-1"), "submit", engineer, { expectedVersion: 6 }));
    expect(error.code).toBe("conflict");
    expect(error.field).toBe("version");
    expect(error.message).toContain("version 6");
  });

  it("submit refuses a stale draft", () => {
    const error = thrown(() => transition(snapshot("draft", "eng-1", { stale: true }), "submit", engineer));
    expect(error.code).toBe("stale");
  });

  it("rebase clears staleness and bumps the revision, so the old simulation stops counting", () => {
    const result = transition(snapshot("simulated", "eng-1", { stale: true }), "rebase", engineer);
    expect(result.to).toBe("submitted");
    expect(result.patch).toEqual({ state: "submitted", version: 8, revision: 4, stale: false, staleReason: null });
    expect(result.event.revision).toBe(4);
  });

  it("edit bumps the revision; submit does not", () => {
    expect(transition(snapshot("draft", "eng-1"), "edit", engineer).patch.revision).toBe(4);
    expect(transition(snapshot("draft", "eng-1"), "submit", engineer).patch.revision).toBeUndefined();
  });

  it("simulation_finished refuses a report about an older revision with conflict", () => {
    const error = thrown(() =>
      transition(snapshot("submitted", "eng-1", { revision: 5 }), "simulation_finished", SYSTEM_ACTOR, {
        simulatedRevision: 4,
      }),
    );
    expect(error.code).toBe("conflict");
    expect(error.message).toContain("revision 4");
  });

  it("simulation_failed leaves the request submitted and records the error", () => {
    const result = transition(snapshot("submitted", "eng-1"), "simulation_failed", SYSTEM_ACTOR, {
      simulatedRevision: 3,
      error: "out of memory",
    });
    expect(result.to).toBe("submitted");
    expect(result.event.type).toBe("request.simulation_failed");
    expect(result.event.error).toBe("out of memory");
  });

  it("an unknown action is invalid, not a crash", () => {
    const error = thrown(() => transition(snapshot("draft", "eng-1"), "launch" as RequestAction, engineer));
    expect(error.code).toBe("invalid");
  });
});

describe("availableActions(request, actor)", () => {
  it("offers the owner approve, reject and return on a fresh simulated request of another author", () => {
    expect(availableActions(snapshot("simulated", "eng-1"), { id: "o", role: "owner" })).toEqual([
      "approve",
      "reject",
      "return",
    ]);
  });

  it("drops approve when the request is stale", () => {
    expect(availableActions(snapshot("simulated", "eng-1", { stale: true }), { id: "o", role: "owner" })).toEqual([
      "reject",
      "return",
    ]);
  });

  it("offers the author of a simulated request withdraw and rebase only", () => {
    expect(availableActions(snapshot("simulated", "eng-1"), { id: "eng-1", role: "engineer" })).toEqual([
      "withdraw",
      "rebase",
    ]);
  });

  it("offers nothing on a final state", () => {
    for (const role of ROLES) {
      expect(availableActions(snapshot("rolled_back", "x"), { id: "x", role })).toEqual([]);
      expect(availableActions(snapshot("rejected", "x"), { id: "x", role })).toEqual([]);
    }
  });
});

describe("assertCan(actor, permission) and labels", () => {
  it("throws unauthenticated without an actor and forbidden without the permission", () => {
    expect(thrown(() => assertCan(null, "request.read")).code).toBe("unauthenticated");
    expect(thrown(() => assertCan({ id: "v", role: "viewer" }, "request.create")).code).toBe("forbidden");
    expect(thrown(() => assertCan(SYSTEM_ACTOR, "request.read")).code).toBe("forbidden");
    expect(() => assertCan({ id: "e", role: "engineer" }, "request.create")).not.toThrow();
  });

  it("isEditableState(state) holds for draft and returned only", () => {
    expect(REQUEST_STATES.filter(isEditableState)).toEqual(["draft", "returned"]);
  });

  it("labels every state and action with text that is not the id", () => {
    for (const state of REQUEST_STATES) expect(STATE_LABELS[state]).toMatch(/^[A-Z]/);
    for (const action of REQUEST_ACTIONS) expect(ACTION_LABELS[action]).toMatch(/^[A-Z]/);
  });
});
