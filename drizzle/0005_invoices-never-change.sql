-- An issued invoice or credit note never changes and is never removed: a correction is a new
-- credit note. The app has no path that edits them; this refuses it at the database too.
CREATE FUNCTION "invoices_refuse_change"() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
	RAISE EXCEPTION 'invoice % is issued and cannot be changed or removed; issue a credit note', OLD."number"
		USING ERRCODE = 'check_violation';
END;
$$;--> statement-breakpoint
CREATE TRIGGER "invoices_never_change" BEFORE UPDATE OR DELETE ON "invoices"
	FOR EACH ROW EXECUTE FUNCTION "invoices_refuse_change"();
