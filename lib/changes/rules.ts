// The life of a change request as a table of legal transitions, and the one function that
// decides whether an actor may take an action now. Pure: the caller loads the request,
// calls transition(), then writes the patch and the event in one database transaction.

import { can, type Permission, type Role } from "./roles";
import { DomainError } from "./errors";

export type RequestState =
  | "draft"
  | "submitted"
  | "simulated"
  | "approved"
  | "rejected"
  | "returned"
  | "implemented"
  | "rolled_back";

export const REQUEST_STATES: readonly RequestState[] = [
  "draft",
  "submitted",
  "simulated",
  "approved",
  "rejected",
  "returned",
  "implemented",
  "rolled_back",
];

/** Display names, our own words. */
export const STATE_LABELS: Readonly<Record<RequestState, string>> = {
  draft: "Draft",
  submitted: "Waiting for simulation",
  simulated: "Ready for review",
  approved: "Approved, awaiting field work",
  rejected: "Rejected",
  returned: "Sent back for revision",
  implemented: "Live on the network",
  rolled_back: "Rolled back",
};

/**
 * States in which a request has not been decided yet: they can conflict with one another
 * and become stale when another request on the same cells is approved or implemented.
 */
export const OPEN_STATES: readonly RequestState[] = ["draft", "submitted", "simulated", "returned"];

/** States from which no transition leads anywhere. */
export const FINAL_STATES: readonly RequestState[] = ["rejected", "rolled_back"];

export function isOpenState(state: RequestState): boolean {
  return OPEN_STATES.includes(state);
}

export type RequestAction =
  | "submit"
  | "edit"
  | "withdraw"
  | "rebase"
  | "simulation_finished"
  | "simulation_failed"
  | "approve"
  | "reject"
  | "return"
  | "implement"
  | "rollback";

export const REQUEST_ACTIONS: readonly RequestAction[] = [
  "submit",
  "edit",
  "withdraw",
  "rebase",
  "simulation_finished",
  "simulation_failed",
  "approve",
  "reject",
  "return",
  "implement",
  "rollback",
];

/** Actions a person takes through the action endpoint (edit has its own body; the rest are the system's). */
export const USER_ACTIONS = ["submit", "withdraw", "rebase", "approve", "reject", "return", "implement", "rollback"] as const;
export type UserAction = (typeof USER_ACTIONS)[number];

/** Actions only the simulation job reports. */
export const SYSTEM_ACTIONS: readonly RequestAction[] = ["simulation_finished", "simulation_failed"];

export const ACTION_LABELS: Readonly<Record<RequestAction, string>> = {
  submit: "Submit for review",
  edit: "Edit",
  withdraw: "Withdraw to draft",
  rebase: "Rebase on the latest network",
  simulation_finished: "Simulation finished",
  simulation_failed: "Simulation failed",
  approve: "Approve",
  reject: "Reject",
  return: "Send back for revision",
  implement: "Mark implemented",
  rollback: "Mark rolled back",
};

/** What the audit trail records for each action (AuditEvent.action). */
export type RequestEventType =
  | "request.created"
  | "request.commented"
  | "request.submitted"
  | "request.edited"
  | "request.withdrawn"
  | "request.rebased"
  | "request.simulated"
  | "request.simulation_failed"
  | "request.approved"
  | "request.rejected"
  | "request.returned"
  | "request.implemented"
  | "request.rolled_back"
  | "request.marked_stale";

const EVENT_OF: Readonly<Record<RequestAction, RequestEventType>> = {
  submit: "request.submitted",
  edit: "request.edited",
  withdraw: "request.withdrawn",
  rebase: "request.rebased",
  simulation_finished: "request.simulated",
  simulation_failed: "request.simulation_failed",
  approve: "request.approved",
  reject: "request.rejected",
  return: "request.returned",
  implement: "request.implemented",
  rollback: "request.rolled_back",
};

/** Conditions a rule checks beyond state and role. */
export type Precondition =
  /** Not marked stale: rebase first. */
  | "fresh"
  /** A finished simulation of the current revision exists. */
  | "simulation_current"
  /** A non-empty comment says why. */
  | "comment"
  /** The simulation report names the request's current revision. */
  | "report_matches_revision";

export interface TransitionRule {
  action: RequestAction;
  from: RequestState;
  to: RequestState;
  /** The permission the actor's role needs, or "system" for the simulation job. */
  by: Permission | "system";
  /** author: only the request's author; not_author: anyone but the author (four-eyes). */
  who: "author" | "not_author" | "anyone";
  requires: readonly Precondition[];
}

/**
 * Every legal transition; anything not listed is refused.
 *
 * Decisions (DESIGN §3 leaves them open):
 * - A failed simulation leaves the request where it was ("submitted") with the error recorded
 *   in the event; the author can withdraw and revise, or the job can be retried.
 * - "returned" is a resting state, so the author's list shows the owner's verdict and comment
 *   until the author acts; the author's first edit (or a rebase) moves it to draft.
 * - "withdraw" (our addition) lets the author pull a submitted or simulated request back to
 *   draft, since edits are allowed only in draft.
 * - Rebase moves a request onto the latest network version: in draft it stays draft; once
 *   submitted it must be simulated again, so it lands in "submitted".
 * - Submitting a stale request is refused: its simulation would be of an outdated baseline
 *   that can never be approved.
 * - Reject and return also obey four-eyes: the verdict is the reviewer's, whatever it is;
 *   an author who wants out withdraws. They do not require a fresh simulation: saying no
 *   needs no up-to-date prediction.
 * - Implement and rollback are the field role's (see roles.ts); anyone with it, author or not.
 */
export const TRANSITIONS: readonly TransitionRule[] = [
  { action: "submit", from: "draft", to: "submitted", by: "request.submit", who: "author", requires: ["fresh"] },
  { action: "edit", from: "draft", to: "draft", by: "request.edit", who: "author", requires: [] },
  { action: "edit", from: "returned", to: "draft", by: "request.edit", who: "author", requires: [] },
  { action: "withdraw", from: "submitted", to: "draft", by: "request.edit", who: "author", requires: [] },
  { action: "withdraw", from: "simulated", to: "draft", by: "request.edit", who: "author", requires: [] },
  { action: "rebase", from: "draft", to: "draft", by: "request.rebase", who: "author", requires: [] },
  { action: "rebase", from: "submitted", to: "submitted", by: "request.rebase", who: "author", requires: [] },
  { action: "rebase", from: "simulated", to: "submitted", by: "request.rebase", who: "author", requires: [] },
  { action: "rebase", from: "returned", to: "draft", by: "request.rebase", who: "author", requires: [] },
  {
    action: "simulation_finished",
    from: "submitted",
    to: "simulated",
    by: "system",
    who: "anyone",
    requires: ["report_matches_revision"],
  },
  {
    action: "simulation_failed",
    from: "submitted",
    to: "submitted",
    by: "system",
    who: "anyone",
    requires: ["report_matches_revision"],
  },
  {
    action: "approve",
    from: "simulated",
    to: "approved",
    by: "request.approve",
    who: "not_author",
    requires: ["fresh", "simulation_current"],
  },
  { action: "reject", from: "simulated", to: "rejected", by: "request.reject", who: "not_author", requires: ["comment"] },
  { action: "return", from: "simulated", to: "returned", by: "request.return", who: "not_author", requires: ["comment"] },
  { action: "implement", from: "approved", to: "implemented", by: "request.implement", who: "anyone", requires: [] },
  { action: "rollback", from: "implemented", to: "rolled_back", by: "request.rollback", who: "anyone", requires: [] },
];

/** The simulation job, which reports results; it holds no user role. */
export const SYSTEM_ACTOR = { id: "system", role: "system" } as const;

export interface Actor {
  id: string;
  role: Role | "system";
}

/** What the rules need to know about a request; the rest of it is the caller's. */
export interface RequestSnapshot {
  id: string;
  state: RequestState;
  authorId: string;
  /** Content revision: bumps on every edit or rebase. */
  revision: number;
  /** Revision of the latest successfully finished submission simulation, or null. */
  simulatedRevision: number | null;
  /** Another request on the same cells was approved or implemented since this one's baseline. */
  stale: boolean;
  /** Optimistic lock: bumps on every write. */
  version: number;
}

export interface TransitionInput {
  /** The version the client last read; a mismatch loses with "conflict". */
  expectedVersion?: number;
  comment?: string | null;
  /** For simulation reports: the revision that was simulated. */
  simulatedRevision?: number;
  /** For simulation_failed: what went wrong. */
  error?: string;
}

/** Fields the caller writes back on the request row. */
export interface TransitionPatch {
  state: RequestState;
  version: number;
  revision?: number;
  stale?: false;
  staleReason?: null;
  /** Set by approve, reject and return: who decided. */
  approverId?: string;
}

export interface TransitionEvent {
  type: RequestEventType;
  requestId: string;
  actorId: string;
  action: RequestAction;
  from: RequestState;
  to: RequestState;
  /** Revision the event concerns (after the transition). */
  revision: number;
  comment: string | null;
  /** simulation_failed: the error text. */
  error: string | null;
}

export interface TransitionResult {
  ok: true;
  from: RequestState;
  to: RequestState;
  rule: TransitionRule;
  patch: TransitionPatch;
  event: TransitionEvent;
}

function rulesFor(action: RequestAction): TransitionRule[] {
  return TRANSITIONS.filter((r) => r.action === action);
}

function describeStates(states: readonly RequestState[]): string {
  return states.map((s) => `"${s}"`).join(" or ");
}

/**
 * Decide whether `actor` may take `action` on `request` now. Returns the target state, the
 * patch to write and the audit event; throws DomainError otherwise, checking in this order:
 * forbidden (role or system), conflict (version), illegal_transition (state), forbidden
 * (not the author) / four_eyes (the author), stale, simulation_required, invalid (comment),
 * conflict (simulation report for another revision).
 */
export function transition(
  request: RequestSnapshot,
  action: RequestAction,
  actor: Actor,
  input: TransitionInput = {},
): TransitionResult {
  const candidates = rulesFor(action);
  if (candidates.length === 0) {
    throw new DomainError("invalid", `unknown action "${String(action)}"`, { field: "action" });
  }
  const context = { requestId: request.id, state: request.state, action, role: actor.role };
  const where = `request ${request.id} is "${request.state}"`;

  // Who may attempt this action at all (the same for every rule of one action).
  const by = candidates[0].by;
  if (by === "system") {
    if (actor.role !== "system") {
      throw new DomainError("forbidden", `cannot ${action}: only the simulation job reports results`, { context });
    }
  } else if (actor.role === "system" || !can(actor.role, by)) {
    throw new DomainError("forbidden", `cannot ${action}: the role "${actor.role}" lacks the permission "${by}"`, {
      context,
    });
  }

  if (input.expectedVersion !== undefined && input.expectedVersion !== request.version) {
    throw new DomainError(
      "conflict",
      `cannot ${action}: request ${request.id} changed since it was read (version ${input.expectedVersion} read, now ${request.version}); reload and try again`,
      { field: "version", context: { ...context, expectedVersion: input.expectedVersion, version: request.version } },
    );
  }

  const rule = candidates.find((r) => r.from === request.state);
  if (rule === undefined) {
    const allowed = candidates.map((r) => r.from);
    throw new DomainError(
      "illegal_transition",
      `cannot ${action}: ${where}; "${action}" is allowed only from ${describeStates(allowed)}`,
      { context },
    );
  }

  if (rule.who === "author" && actor.id !== request.authorId) {
    throw new DomainError("forbidden", `cannot ${action}: only the author of request ${request.id} may do that`, {
      context,
    });
  }
  if (rule.who === "not_author" && actor.id === request.authorId) {
    throw new DomainError(
      "four_eyes",
      `cannot ${action}: the author of request ${request.id} cannot decide on it; another owner must (four-eyes rule)`,
      { context },
    );
  }

  const comment = typeof input.comment === "string" ? input.comment.trim() : "";
  for (const need of rule.requires) {
    if (need === "fresh" && request.stale) {
      throw new DomainError(
        "stale",
        `cannot ${action}: request ${request.id} is stale (another request on the same cells was approved or implemented); rebase it and simulate again`,
        { context },
      );
    }
    if (need === "simulation_current" && request.simulatedRevision !== request.revision) {
      const had = request.simulatedRevision === null ? "none" : `revision ${request.simulatedRevision}`;
      throw new DomainError(
        "simulation_required",
        `cannot ${action}: request ${request.id} needs a finished simulation of revision ${request.revision} (simulated: ${had})`,
        { context: { ...context, revision: request.revision, simulatedRevision: request.simulatedRevision } },
      );
    }
    if (need === "comment" && comment === "") {
      throw new DomainError("invalid", `cannot ${action}: a comment saying why is required`, {
        field: "comment",
        details: [{ path: "comment", message: `required to ${action} a request` }],
        context,
      });
    }
    if (need === "report_matches_revision" && input.simulatedRevision !== request.revision) {
      throw new DomainError(
        "conflict",
        `cannot record ${action}: the simulation was of revision ${String(input.simulatedRevision)} but request ${request.id} is at revision ${request.revision}; the result is out of date`,
        { context: { ...context, revision: request.revision, simulatedRevision: input.simulatedRevision ?? null } },
      );
    }
  }

  // A new revision whenever the content or its baseline changes: an old simulation no longer counts.
  const newRevision = action === "edit" || action === "rebase" ? request.revision + 1 : request.revision;
  const patch: TransitionPatch = { state: rule.to, version: request.version + 1 };
  if (newRevision !== request.revision) patch.revision = newRevision;
  if (action === "rebase") {
    patch.stale = false;
    patch.staleReason = null;
  }
  if (action === "approve" || action === "reject" || action === "return") patch.approverId = actor.id;

  return {
    ok: true,
    from: request.state,
    to: rule.to,
    rule,
    patch,
    event: {
      type: EVENT_OF[action],
      requestId: request.id,
      actorId: actor.id,
      action,
      from: request.state,
      to: rule.to,
      revision: newRevision,
      comment: comment === "" ? null : comment,
      error: action === "simulation_failed" ? (input.error ?? "simulation failed") : null,
    },
  };
}

/** The actions `actor` could take on `request` now (for showing buttons); never throws. */
export function availableActions(request: RequestSnapshot, actor: Actor): RequestAction[] {
  const out: RequestAction[] = [];
  for (const action of REQUEST_ACTIONS) {
    // Comments are supplied at the moment of acting; do not hide reject/return for lack of one.
    const input: TransitionInput = {
      comment: "(comment)",
      simulatedRevision: request.revision,
    };
    try {
      transition(request, action, actor, input);
      out.push(action);
    } catch (error) {
      if (!(error instanceof DomainError)) throw error;
    }
  }
  return out;
}

/** Throws "forbidden" unless the actor's role holds the permission (for reads and non-transition writes). */
export function assertCan(actor: Actor | null | undefined, permission: Permission): void {
  if (actor === null || actor === undefined) {
    throw new DomainError("unauthenticated", "sign in first");
  }
  if (actor.role === "system" || !can(actor.role, permission)) {
    throw new DomainError("forbidden", `the role "${actor.role}" lacks the permission "${permission}"`, {
      context: { role: actor.role, permission },
    });
  }
}

/**
 * Whether an edit is accepted in this state: in draft, or in returned (the edit lands the
 * request in draft). Submitted and later requests must be withdrawn first.
 */
export function isEditableState(state: RequestState): boolean {
  return TRANSITIONS.some((r) => r.action === "edit" && r.from === state);
}
