import type { Knex } from 'knex';

/**
 * A signed-in session carries its account as the web process needs it on every request (id,
 * address, name, affiliation, roles), so that a request reads one row (the session), not two
 * (the session, then the account with its roles).
 *
 * The database keeps that copy true, whoever writes:
 * - every write of a session's `sess` (sign-in, any save by express-session) replaces the copy
 *   with the account as it is now; the session of a disabled account is not stored at all;
 * - every change of an account's address, name, affiliation or disabled state, and every role
 *   granted or removed, rewrites the copy in each of that account's sessions, in the same
 *   transaction; disabling an account deletes its sessions (signed out everywhere).
 * `session_account_id` reads the account of a session whether it holds the copy or, as
 * sessions stored before this migration do, the bare account id.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.raw(`
    CREATE FUNCTION session_account_id(sess json) RETURNS int LANGUAGE sql IMMUTABLE AS $$
      SELECT CASE json_typeof(sess -> 'passport' -> 'user')
        WHEN 'number' THEN (sess -> 'passport' ->> 'user')::int
        WHEN 'object' THEN (sess -> 'passport' -> 'user' ->> 'id')::int
      END
    $$;
    CREATE INDEX sessions_account_index ON sessions (session_account_id(sess));

    CREATE FUNCTION session_user_of(account int) RETURNS jsonb LANGUAGE sql STABLE AS $$
      SELECT jsonb_build_object(
        'id', a.id, 'email', a.email, 'displayName', a.display_name, 'affiliation', a.affiliation,
        'roles', coalesce((SELECT jsonb_agg(r.role ORDER BY r.role) FROM account_roles r WHERE r.account_id = a.id), '[]'::jsonb))
      FROM accounts a WHERE a.id = account AND a.disabled_at IS NULL
    $$;

    CREATE FUNCTION sessions_copy_account() RETURNS trigger LANGUAGE plpgsql AS $$
    DECLARE
      account int := session_account_id(NEW.sess);
      copy jsonb;
    BEGIN
      IF account IS NULL THEN RETURN NEW; END IF;
      copy := session_user_of(account);
      -- A disabled (or removed) account keeps no session: the write is skipped.
      IF copy IS NULL THEN RETURN NULL; END IF;
      NEW.sess := jsonb_set(NEW.sess::jsonb, '{passport,user}', copy)::json;
      RETURN NEW;
    END $$;
    CREATE TRIGGER sessions_copy_account BEFORE INSERT OR UPDATE OF sess ON sessions
      FOR EACH ROW EXECUTE FUNCTION sessions_copy_account();

    -- Writing sess = sess runs the trigger above, which copies the account afresh.
    CREATE FUNCTION sessions_recopy(accounts int[]) RETURNS void LANGUAGE sql AS $$
      DELETE FROM sessions WHERE session_account_id(sess) = ANY(accounts) AND session_user_of(session_account_id(sess)) IS NULL;
      UPDATE sessions SET sess = sess WHERE session_account_id(sess) = ANY(accounts);
    $$;
    CREATE FUNCTION sessions_recopy_by_account() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      PERFORM sessions_recopy(ARRAY[NEW.id]);
      RETURN NULL;
    END $$;
    CREATE TRIGGER accounts_sessions_recopy AFTER UPDATE OF email, display_name, affiliation, disabled_at ON accounts
      FOR EACH ROW WHEN (OLD.email IS DISTINCT FROM NEW.email OR OLD.display_name IS DISTINCT FROM NEW.display_name
        OR OLD.affiliation IS DISTINCT FROM NEW.affiliation OR OLD.disabled_at IS DISTINCT FROM NEW.disabled_at)
      EXECUTE FUNCTION sessions_recopy_by_account();

    CREATE FUNCTION sessions_recopy_by_roles() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      IF TG_OP = 'INSERT' THEN
        PERFORM sessions_recopy(ARRAY(SELECT DISTINCT account_id FROM new_rows));
      ELSIF TG_OP = 'DELETE' THEN
        PERFORM sessions_recopy(ARRAY(SELECT DISTINCT account_id FROM old_rows));
      ELSE
        PERFORM sessions_recopy(ARRAY(SELECT account_id FROM new_rows UNION SELECT account_id FROM old_rows));
      END IF;
      RETURN NULL;
    END $$;
    CREATE TRIGGER account_roles_sessions_recopy_insert AFTER INSERT ON account_roles REFERENCING NEW TABLE AS new_rows
      FOR EACH STATEMENT EXECUTE FUNCTION sessions_recopy_by_roles();
    CREATE TRIGGER account_roles_sessions_recopy_update AFTER UPDATE ON account_roles REFERENCING NEW TABLE AS new_rows OLD TABLE AS old_rows
      FOR EACH STATEMENT EXECUTE FUNCTION sessions_recopy_by_roles();
    CREATE TRIGGER account_roles_sessions_recopy_delete AFTER DELETE ON account_roles REFERENCING OLD TABLE AS old_rows
      FOR EACH STATEMENT EXECUTE FUNCTION sessions_recopy_by_roles();

    -- Sessions stored before: their bare account id becomes the copy (those of disabled accounts go).
    SELECT sessions_recopy(ARRAY(SELECT DISTINCT session_account_id(sess) FROM sessions WHERE session_account_id(sess) IS NOT NULL));
  `);
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw(`
    DROP TRIGGER account_roles_sessions_recopy_delete ON account_roles;
    DROP TRIGGER account_roles_sessions_recopy_update ON account_roles;
    DROP TRIGGER account_roles_sessions_recopy_insert ON account_roles;
    DROP FUNCTION sessions_recopy_by_roles();
    DROP TRIGGER accounts_sessions_recopy ON accounts;
    DROP FUNCTION sessions_recopy_by_account();
    DROP FUNCTION sessions_recopy(int[]);
    DROP TRIGGER sessions_copy_account ON sessions;
    DROP FUNCTION sessions_copy_account();
    DROP FUNCTION session_user_of(int);
    DROP INDEX sessions_account_index;
    UPDATE sessions SET sess = jsonb_set(sess::jsonb, '{passport,user}', to_jsonb(session_account_id(sess)))::json
      WHERE json_typeof(sess -> 'passport' -> 'user') = 'object';
    DROP FUNCTION session_account_id(json);
  `);
}
