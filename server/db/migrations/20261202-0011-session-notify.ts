import type { MigrationContext } from '../umzug';

/**
 * The server keeps the people behind live sessions in memory (server/lib/session-cache.ts). These triggers
 * tell it, through NOTIFY on `sowright_sessions` with the user's id, when what a session rests on changes:
 * a person's workspace, role, status, token version or farmer grower, a person removed, or a consultant's
 * growers. PostgreSQL delivers the notice at commit, to every listening server, whoever made the change.
 */
export async function up({ context: sequelize }: MigrationContext) {
  await sequelize.query(`
    CREATE FUNCTION sowright_session_changed() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      IF TG_TABLE_NAME = 'users' THEN
        PERFORM pg_notify('sowright_sessions', OLD.id::text);
      ELSIF TG_OP = 'INSERT' THEN
        PERFORM pg_notify('sowright_sessions', NEW.user_id::text);
      ELSE
        PERFORM pg_notify('sowright_sessions', OLD.user_id::text);
        IF TG_OP = 'UPDATE' AND NEW.user_id <> OLD.user_id THEN
          PERFORM pg_notify('sowright_sessions', NEW.user_id::text);
        END IF;
      END IF;
      RETURN NULL;
    END $$;

    CREATE TRIGGER users_session_update AFTER UPDATE ON users FOR EACH ROW
      WHEN (OLD.workspace_id IS DISTINCT FROM NEW.workspace_id OR OLD.role IS DISTINCT FROM NEW.role
            OR OLD.status IS DISTINCT FROM NEW.status OR OLD.token_version IS DISTINCT FROM NEW.token_version
            OR OLD.grower_id IS DISTINCT FROM NEW.grower_id OR OLD.id IS DISTINCT FROM NEW.id)
      EXECUTE FUNCTION sowright_session_changed();
    CREATE TRIGGER users_session_delete AFTER DELETE ON users FOR EACH ROW
      EXECUTE FUNCTION sowright_session_changed();
    CREATE TRIGGER consultant_growers_session AFTER INSERT OR UPDATE OR DELETE ON consultant_growers
      FOR EACH ROW EXECUTE FUNCTION sowright_session_changed();
  `);
}

export async function down({ context: sequelize }: MigrationContext) {
  await sequelize.query(`
    DROP TRIGGER consultant_growers_session ON consultant_growers;
    DROP TRIGGER users_session_delete ON users;
    DROP TRIGGER users_session_update ON users;
    DROP FUNCTION sowright_session_changed();
  `);
}
