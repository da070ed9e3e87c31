"use client";
// The user list with its per-row actions and the form that creates an account. Writes go through
// /api/admin/users; a refusal shows its message beside the field it names and keeps what was typed.
import { useState } from "react";
import type { UserDto } from "@/lib/db/users";
import { sendJson, type ApiFailure } from "../../_components/api";

export interface RoleOption {
  role: string;
  label: string;
}

const MIN_PASSWORD = 10;

/** A readable random password for a new or reset account (the server only stores its hash). */
function suggestPassword(): string {
  const alphabet = "abcdefghjkmnpqrstuvwxyzABCDEFGHJKMNPQRSTUVWXYZ23456789";
  const bytes = crypto.getRandomValues(new Uint8Array(16));
  let out = "";
  bytes.forEach((b, i) => {
    out += alphabet[b % alphabet.length];
    if (i % 4 === 3 && i < 15) out += "-";
  });
  return out;
}

function FieldError({ id, message }: { id: string; message?: string }) {
  if (!message) return null;
  return (
    <div className="field-error" id={id} role="alert">
      {message}
    </div>
  );
}

export function UsersAdmin({ users: initial, roles, selfId }: { users: UserDto[]; roles: RoleOption[]; selfId: string }) {
  const [users, setUsers] = useState(initial);
  const [notice, setNotice] = useState<string | null>(null);
  const labelOf = (role: string) => roles.find((r) => r.role === role)?.label ?? role;
  const replace = (user: UserDto) => setUsers((list) => list.map((u) => (u.id === user.id ? user : u)));
  const active = users.filter((u) => u.active).length;

  return (
    <>
      {notice && (
        <div className="banner info" role="status">
          {notice}
        </div>
      )}
      <div className="panel">
        <h2 className="panel-title">Accounts</h2>
        <p className="muted panel-note">
          {users.length} accounts, {active} active. Deactivated accounts can no longer sign in; their past actions stay on record.
        </p>
        <div style={{ overflowX: "auto" }}>
          <table className="data users-table" data-testid="users-table">
            <thead>
              <tr>
                <th>Name</th>
                <th>E-mail</th>
                <th>Role</th>
                <th>Status</th>
                <th>Since</th>
                <th>Password</th>
              </tr>
            </thead>
            <tbody>
              {users.map((user) => (
                <UserRow key={user.id} user={user} roles={roles} self={user.id === selfId} onChanged={replace} onNotice={setNotice} labelOf={labelOf} />
              ))}
            </tbody>
          </table>
        </div>
      </div>
      <NewUserForm
        roles={roles}
        onCreated={(user) => {
          setUsers((list) => [...list, user]);
          setNotice(`Account created for ${user.name} (${labelOf(user.role)}). Give them the initial password by a separate channel.`);
        }}
      />
    </>
  );
}

function UserRow({
  user,
  roles,
  self,
  onChanged,
  onNotice,
  labelOf,
}: {
  user: UserDto;
  roles: RoleOption[];
  self: boolean;
  onChanged: (user: UserDto) => void;
  onNotice: (text: string) => void;
  labelOf: (role: string) => string;
}) {
  const [role, setRole] = useState(user.role);
  const [resetting, setResetting] = useState(false);
  const [password, setPassword] = useState("");
  const [busy, setBusy] = useState(false);
  const [failure, setFailure] = useState<ApiFailure | null>(null);

  const patch = async (body: Record<string, unknown>, done: (user: UserDto) => string) => {
    setBusy(true);
    setFailure(null);
    const result = await sendJson<UserDto>("PATCH", `/api/admin/users/${encodeURIComponent(user.id)}`, body);
    setBusy(false);
    if (!result.ok) {
      setFailure(result.failure);
      return false;
    }
    onChanged(result.data);
    onNotice(done(result.data));
    return true;
  };
  const rowId = `user-${user.id}`;
  const otherError = failure && !failure.fields.role && !failure.fields.password && !failure.fields.active ? failure.message : null;

  return (
    <tr data-testid="user-row" data-email={user.email} className={user.active ? undefined : "inactive"}>
      <td>
        {user.name} {self && <span className="badge info">you</span>}
      </td>
      <td>{user.email}</td>
      <td>
        <div className="inline-field">
          <select
            aria-label={`Role of ${user.name}`}
            value={role}
            disabled={self || busy}
            title={self ? "An administrator cannot change their own role" : undefined}
            onChange={(e) => setRole(e.target.value)}
          >
            {roles.map((r) => (
              <option key={r.role} value={r.role}>
                {r.label}
              </option>
            ))}
          </select>
          {role !== user.role && (
            <>
              <button type="button" className="secondary small" disabled={busy} onClick={() => patch({ role }, (u) => `${u.name} is now ${labelOf(u.role)}.`)}>
                Save role
              </button>
              <button type="button" className="link" onClick={() => setRole(user.role)}>
                cancel
              </button>
            </>
          )}
        </div>
        <FieldError id={`${rowId}-role`} message={failure?.fields.role} />
      </td>
      <td>
        <div className="inline-field">
          <span className={user.active ? "badge good" : "badge"}>{user.active ? "active" : "deactivated"}</span>
          {!self && (
            <button
              type="button"
              className="secondary small"
              disabled={busy}
              onClick={() => {
                if (user.active && !window.confirm(`Deactivate ${user.name}? They will no longer be able to sign in.`)) return;
                void patch({ active: !user.active }, (u) => `${u.name} ${u.active ? "can sign in again" : "is deactivated"}.`);
              }}
            >
              {user.active ? "Deactivate" : "Reactivate"}
            </button>
          )}
        </div>
        <FieldError id={`${rowId}-active`} message={failure?.fields.active} />
      </td>
      <td className="muted">{user.createdAt.slice(0, 10)}</td>
      <td>
        {resetting ? (
          <form
            className="inline-field"
            onSubmit={async (e) => {
              e.preventDefault();
              const ok = await patch({ password }, (u) => `The password of ${u.name} was reset. Give it to them by a separate channel.`);
              if (ok) {
                setResetting(false);
                setPassword("");
              }
            }}
          >
            <input
              aria-label={`New password for ${user.name}`}
              value={password}
              onChange={(e) => setPassword(e.target.value)}
              minLength={MIN_PASSWORD}
              required
              autoComplete="new-password"
              aria-invalid={failure?.fields.password ? true : undefined}
              aria-describedby={failure?.fields.password ? `${rowId}-password` : undefined}
            />
            <button type="button" className="link" onClick={() => setPassword(suggestPassword())}>
              suggest
            </button>
            <button type="submit" className="secondary small" disabled={busy}>
              Save
            </button>
            <button type="button" className="link" onClick={() => {
                setResetting(false);
                setFailure(null);
              }}>
              cancel
            </button>
          </form>
        ) : (
          <button type="button" className="secondary small" onClick={() => setResetting(true)}>
            Reset password
          </button>
        )}
        <FieldError id={`${rowId}-password`} message={failure?.fields.password} />
        {otherError && (
          <div className="field-error" role="alert">
            {otherError}
          </div>
        )}
      </td>
    </tr>
  );
}

function NewUserForm({ roles, onCreated }: { roles: RoleOption[]; onCreated: (user: UserDto) => void }) {
  const empty = { email: "", name: "", role: "viewer", password: "" };
  const [form, setForm] = useState(empty);
  const [busy, setBusy] = useState(false);
  const [failure, setFailure] = useState<ApiFailure | null>(null);
  const set = (key: keyof typeof empty) => (e: React.ChangeEvent<HTMLInputElement | HTMLSelectElement>) => setForm({ ...form, [key]: e.target.value });
  const invalid = (key: string) => (failure?.fields[key] ? { "aria-invalid": true, "aria-describedby": `new-${key}-error` } : {});
  const fieldNames = ["email", "name", "role", "password"];
  const formError = failure && !fieldNames.some((k) => failure.fields[k]) ? failure.message : null;

  return (
    <form
      className="panel new-user"
      aria-labelledby="new-user-heading"
      onSubmit={async (e) => {
        e.preventDefault();
        setBusy(true);
        setFailure(null);
        const result = await sendJson<UserDto>("POST", "/api/admin/users", form);
        setBusy(false);
        if (!result.ok) return setFailure(result.failure);
        setForm(empty);
        onCreated(result.data);
      }}
    >
      <h2 id="new-user-heading" className="panel-title">
        New account
      </h2>
      <div className="form-grid">
        <div>
          <label htmlFor="new-email">E-mail</label>
          <input id="new-email" type="email" value={form.email} onChange={set("email")} required autoComplete="off" {...invalid("email")} />
          <FieldError id="new-email-error" message={failure?.fields.email} />
        </div>
        <div>
          <label htmlFor="new-name">Name</label>
          <input id="new-name" value={form.name} onChange={set("name")} required autoComplete="off" {...invalid("name")} />
          <FieldError id="new-name-error" message={failure?.fields.name} />
        </div>
        <div>
          <label htmlFor="new-role">Role</label>
          <select id="new-role" value={form.role} onChange={set("role")} {...invalid("role")}>
            {roles.map((r) => (
              <option key={r.role} value={r.role}>
                {r.label}
              </option>
            ))}
          </select>
          <FieldError id="new-role-error" message={failure?.fields.role} />
        </div>
        <div>
          <label htmlFor="new-password">Initial password</label>
          <div className="inline-field">
            <input id="new-password" value={form.password} onChange={set("password")} required minLength={MIN_PASSWORD} autoComplete="new-password" {...invalid("password")} />
            <button type="button" className="link" onClick={() => setForm({ ...form, password: suggestPassword() })}>
              suggest
            </button>
          </div>
          <FieldError id="new-password-error" message={failure?.fields.password} />
          {!failure?.fields.password && <div className="muted field-hint">At least {MIN_PASSWORD} characters.</div>}
        </div>
      </div>
      {formError && (
        <div className="field-error" role="alert">
          {formError}
        </div>
      )}
      <p>
        <button type="submit" className="primary" disabled={busy}>
          {busy ? "Creating…" : "Create account"}
        </button>
      </p>
    </form>
  );
}
