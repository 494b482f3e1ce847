-- Hand-written (--custom): every transaction that changes what the cached list answers read leaves its id in
-- result_changes (server/cache/result-cache.ts). Statement triggers, so a 10 000-row screening write costs one
-- insert; ON CONFLICT keeps one row per transaction; writers never wait on each other (distinct keys).
CREATE OR REPLACE FUNCTION brackline_note_result_change() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  INSERT INTO result_changes (txid) VALUES (pg_current_xact_id()) ON CONFLICT (txid) DO NOTHING;
  RETURN NULL;
END $$;--> statement-breakpoint
DO $$
DECLARE t text;
BEGIN
  FOREACH t IN ARRAY ARRAY['leases', 'lease_shares', 'screenings', 'lease_annual_exposure', 'scenarios', 'rivers'] LOOP
    EXECUTE format('CREATE TRIGGER %I AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON %I FOR EACH STATEMENT EXECUTE FUNCTION brackline_note_result_change()',
                   t || '_result_change', t);
  END LOOP;
END $$;--> statement-breakpoint
-- Users change on every sign-in (failure counts, session version); only a holder's name, role or jurisdiction
-- changes a list. Deleting a user deletes their leases, which the leases trigger notes.
CREATE TRIGGER users_result_change AFTER UPDATE OF name, role, jurisdiction_id ON users
  FOR EACH ROW WHEN (OLD.name IS DISTINCT FROM NEW.name OR OLD.role IS DISTINCT FROM NEW.role OR OLD.jurisdiction_id IS DISTINCT FROM NEW.jurisdiction_id)
  EXECUTE FUNCTION brackline_note_result_change();
