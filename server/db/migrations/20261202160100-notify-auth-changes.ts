import type { MigrationContext } from '../migrator'

// Every API process caches session rows and signed-in users in memory (server/middleware/
// authCache.ts). These triggers tell all of them, through NOTIFY on the `waymark_auth` channel,
// when a session row is saved again or deleted (sign-out, expiry sweep, a deactivated user's
// sessions ended) and when a user changes (role, active flag, password), whichever process or
// tool made the change. A notification is delivered when the change commits.
export async function up({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query(`
    CREATE FUNCTION notify_auth_change() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      IF TG_TABLE_NAME = 'sessions' THEN
        PERFORM pg_notify('waymark_auth', 'session:' || OLD.sid);
      ELSE
        PERFORM pg_notify('waymark_auth', 'user:' || OLD.id);
      END IF;
      RETURN NULL;
    END $$`)
  await sequelize.query(`
    CREATE TRIGGER sessions_notify_auth AFTER UPDATE OR DELETE ON sessions
    FOR EACH ROW EXECUTE FUNCTION notify_auth_change()`)
  await sequelize.query(`
    CREATE TRIGGER users_notify_auth AFTER UPDATE OR DELETE ON users
    FOR EACH ROW EXECUTE FUNCTION notify_auth_change()`)
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('DROP TRIGGER users_notify_auth ON users')
  await sequelize.query('DROP TRIGGER sessions_notify_auth ON sessions')
  await sequelize.query('DROP FUNCTION notify_auth_change()')
}
