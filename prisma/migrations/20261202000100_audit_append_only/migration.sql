-- Audit events are append-only: the database itself refuses to change or delete one.
-- (The hash chain still detects an edit made by someone who disables this trigger.)
CREATE OR REPLACE FUNCTION beamgate_audit_append_only() RETURNS trigger AS $$
BEGIN
  RAISE EXCEPTION 'AuditEvent rows are append-only (% refused)', TG_OP;
END;
$$ LANGUAGE plpgsql;

CREATE TRIGGER "AuditEvent_append_only"
  BEFORE UPDATE OR DELETE ON "AuditEvent"
  FOR EACH ROW EXECUTE FUNCTION beamgate_audit_append_only();

CREATE TRIGGER "AuditHead_no_delete"
  BEFORE DELETE ON "AuditHead"
  FOR EACH ROW EXECUTE FUNCTION beamgate_audit_append_only();
