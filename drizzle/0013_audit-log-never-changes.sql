-- An audit row is a record of what happened: it is never edited and never removed. The app has
-- no path that does either; this refuses it at the database too (TRUNCATE included).
CREATE FUNCTION "audit_log_refuse_change"() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
	RAISE EXCEPTION 'the audit log is append-only: its rows cannot be changed or removed'
		USING ERRCODE = 'check_violation';
END;
$$;--> statement-breakpoint
CREATE TRIGGER "audit_log_never_changes" BEFORE UPDATE OR DELETE ON "audit_log"
	FOR EACH ROW EXECUTE FUNCTION "audit_log_refuse_change"();--> statement-breakpoint
CREATE TRIGGER "audit_log_never_truncated" BEFORE TRUNCATE ON "audit_log"
	FOR EACH STATEMENT EXECUTE FUNCTION "audit_log_refuse_change"();
