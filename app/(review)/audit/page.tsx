import Link from "next/link";
import { runtime } from "@/app/_lib/runtime";
import { listAuditEvents, type AuditEventDto } from "@/lib/db/audit";
import { listUsers } from "@/lib/db/users";
import { listNetworks } from "@/lib/db/networks/data";
import { listRequests } from "@/lib/db/requests/data";
import { can } from "@/lib/changes/roles";
import { pageActor } from "../_components/guard";
import { Forbidden } from "../_components/Forbidden";
import { VerifyChainButton } from "./_components/VerifyChainButton";

export const dynamic = "force-dynamic";

const PAGE_SIZE = 50;
const VALUE_CHARS = 48;

function short(value: unknown): string {
  const text = typeof value === "string" ? value : JSON.stringify(value);
  return text.length > VALUE_CHARS ? `${text.slice(0, VALUE_CHARS - 1)}…` : text;
}

function isRecord(value: unknown): value is Record<string, unknown> {
  return typeof value === "object" && value !== null && !Array.isArray(value);
}

// Internal row ids mean nothing on screen (the API still returns the whole event).
const ROW_ID = /^c[a-z0-9]{20,}$/;
const hidden = (key: string, value: unknown) => key.endsWith("Id") && typeof value === "string" && ROW_ID.test(value);

/** Request items ({cellCode, parameter, oldValue?, newValue}) as "CELL parameter old → new". */
function itemLines(value: unknown): string[] | null {
  if (!Array.isArray(value) || value.length === 0) return null;
  const lines: string[] = [];
  for (const item of value) {
    if (!isRecord(item) || typeof item.cellCode !== "string" || typeof item.parameter !== "string" || !("newValue" in item)) return null;
    const old = item.oldValue === undefined || item.oldValue === null ? "" : `${short(item.oldValue)} → `;
    lines.push(`${item.cellCode} ${item.parameter}: ${old}${short(item.newValue)}`);
  }
  return lines;
}

/** "field: old → new" for each field that differs; fields only after (a creation) as "field: value". */
function changeLines(before: unknown, after: unknown): string[] {
  if (before === null && after === null) return [];
  const from = before === null && isRecord(after) ? {} : before;
  const to = after === null && isRecord(before) ? {} : after;
  if (!isRecord(from) || !isRecord(to)) {
    if (before === null) return [short(after)];
    if (after === null) return [`${short(before)} → (removed)`];
    return [`${short(before)} → ${short(after)}`];
  }
  const keys = [...new Set([...Object.keys(from), ...Object.keys(to)])];
  const lines: string[] = [];
  for (const key of keys) {
    const had = key in from, has = key in to;
    if (hidden(key, from[key]) || hidden(key, to[key])) continue;
    if (had && has) {
      if (JSON.stringify(from[key]) === JSON.stringify(to[key])) continue;
      lines.push(`${key}: ${short(from[key])} → ${short(to[key])}`);
    } else if (has) {
      if (to[key] === null) continue;
      const items = itemLines(to[key]);
      if (items) lines.push(...items);
      else lines.push(`${key}: ${short(to[key])}`);
    } else lines.push(`${key}: ${short(from[key])} → (removed)`);
  }
  return lines;
}

interface Names {
  users: Map<string, { name: string; email: string }>;
  networks: Map<string, string>;
  requests: Map<string, { number: number; title: string }>;
}

function entityText(event: AuditEventDto, names: Names): string {
  const type = event.entityType.toLowerCase();
  if (type === "user") {
    const user = names.users.get(event.entityId);
    return user ? `user ${user.name}` : "user (removed)";
  }
  if (type === "network") return `network ${names.networks.get(event.entityId) ?? ""}`.trim();
  if (type === "kpisettings") return `KPI settings of ${names.networks.get(event.entityId) ?? "a network"}`;
  if (type === "changerequest") {
    const request = names.requests.get(event.entityId);
    return request ? `request #${request.number}` : "request";
  }
  if (type === "simulation") return "simulation";
  return event.entityType;
}

export default async function AuditPage({ searchParams }: { searchParams: Promise<{ before?: string | string[] }> }) {
  const gate = await pageActor("audit.read");
  if (!gate.ok) return <Forbidden permission={gate.permission} />;
  const query = await searchParams;
  const beforeNumber = typeof query.before === "string" ? Number(query.before) : NaN;
  const before = Number.isInteger(beforeNumber) && beforeNumber > 1 ? beforeNumber : undefined;

  const { db } = await runtime();
  const [page, newest, users, networks, requests] = await Promise.all([
    listAuditEvents(db.prisma, { take: PAGE_SIZE + 1, beforeSeq: before }),
    listAuditEvents(db.prisma, { take: 1 }),
    listUsers(db.prisma),
    listNetworks(db.prisma),
    listRequests(db.prisma, { take: 10_000 }),
  ]);
  const names: Names = {
    users: new Map(users.map((u) => [u.id, { name: u.name, email: u.email }])),
    networks: new Map(networks.map((n) => [n.id, n.name])),
    requests: new Map(requests.map((r) => [r.id, { number: r.number, title: r.title }])),
  };
  const events = page.slice(0, PAGE_SIZE);
  const hasOlder = page.length > PAGE_SIZE;
  const headSeq = newest[0]?.seq ?? 0;
  const firstShown = events[0]?.seq;
  const lastShown = events[events.length - 1]?.seq;
  // seq has no gaps (appends are serialised), so the newer page is the PAGE_SIZE events above this one
  const newerBefore = firstShown !== undefined && firstShown < headSeq ? firstShown + PAGE_SIZE + 1 : undefined;

  return (
    <main>
      <h1>Audit trail</h1>
      <p className="subtitle">
        Every decision and change, newest first. Events are append-only and each holds the hash of the one before it, so an edit of the
        past breaks the chain.
      </p>

      <div className="panel">
        <h2 className="panel-title">Chain status</h2>
        {can(gate.actor.role, "audit.verify") ? (
          <VerifyChainButton />
        ) : (
          <p className="muted" data-testid="verify-note">
            Verifying the chain is done by operations owners and administrators; the events below are the same for everyone.
          </p>
        )}
      </div>

      <div className="panel">
        <div className="tools audit-tools">
          <strong>
            {events.length === 0 ? "No events" : `Events ${lastShown}–${firstShown}`} of {headSeq}
          </strong>
          <div className="pager">
            {newerBefore !== undefined && (
              <>
                <Link className="secondary" href="/audit">
                  « Newest
                </Link>
                <Link className="secondary" href={newerBefore > headSeq ? "/audit" : `/audit?before=${newerBefore}`}>
                  ‹ Newer
                </Link>
              </>
            )}
            {hasOlder && lastShown !== undefined && (
              <Link className="secondary" href={`/audit?before=${lastShown}`}>
                Older ›
              </Link>
            )}
          </div>
        </div>
        <div style={{ overflowX: "auto" }}>
          <table className="data audit-table" data-testid="audit-table">
            <thead>
              <tr>
                <th className="num">Seq</th>
                <th>Time (UTC)</th>
                <th>Actor</th>
                <th>Action</th>
                <th>Entity</th>
                <th>Request</th>
                <th>Change</th>
              </tr>
            </thead>
            <tbody>
              {events.map((event) => {
                const actor = event.actorId ? names.users.get(event.actorId) : undefined;
                const request = event.requestId ? names.requests.get(event.requestId) : undefined;
                const lines = changeLines(event.before, event.after);
                return (
                  <tr key={event.seq}>
                    <td className="num">{event.seq}</td>
                    <td className="nowrap">{event.at.slice(0, 19).replace("T", " ")}</td>
                    <td>{actor ? <span title={actor.email}>{actor.name}</span> : event.actorEmail ?? <span className="muted">system</span>}</td>
                    <td>
                      <code>{event.action}</code>
                    </td>
                    <td>{entityText(event, names)}</td>
                    <td>
                      {event.requestId ? (
                        <Link href={`/requests/${event.requestId}`} title={request?.title}>
                          {request ? `#${request.number}` : "request"}
                        </Link>
                      ) : (
                        <span className="muted">–</span>
                      )}
                    </td>
                    <td className="audit-change">
                      {lines.length === 0 ? (
                        <span className="muted">–</span>
                      ) : (
                        lines.map((line, i) => (
                          <div key={i} title={line}>
                            {line}
                          </div>
                        ))
                      )}
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </div>
      </div>
    </main>
  );
}
