import type { MigrationContext } from '../migrator'

// Append-only audit log. Two locks: the app role is granted only SELECT and INSERT, and a trigger
// refuses UPDATE and DELETE for everybody, so even a mistaken migration cannot rewrite history.
export async function up({ context: { sequelize, appRole } }: { context: MigrationContext }) {
  const role = `"${appRole.replace(/"/g, '""')}"`
  await sequelize.query(`
    CREATE TABLE audit_events (
      id bigserial PRIMARY KEY,
      at timestamptz NOT NULL DEFAULT now(),
      actor_id uuid NULL,
      actor_email varchar(254) NULL,
      action varchar(64) NOT NULL,
      entity varchar(64) NOT NULL,
      entity_id varchar(64) NULL,
      before jsonb NULL,
      after jsonb NULL,
      ip varchar(64) NULL,
      request_id varchar(64) NULL
    )`)
  // Serves the Admin audit screen (newest first, filtered by entity) and per-record history.
  await sequelize.query(
    'CREATE INDEX audit_events_entity_idx ON audit_events (entity, entity_id, at DESC)',
  )
  await sequelize.query('CREATE INDEX audit_events_at_idx ON audit_events (at DESC)')
  await sequelize.query(`
    CREATE FUNCTION audit_events_refuse_change() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      RAISE EXCEPTION 'audit_events is append-only: % refused', TG_OP;
    END $$`)
  await sequelize.query(`
    CREATE TRIGGER audit_events_append_only BEFORE UPDATE OR DELETE ON audit_events
    FOR EACH ROW EXECUTE FUNCTION audit_events_refuse_change()`)
  await sequelize.query(`
    CREATE TRIGGER audit_events_no_truncate BEFORE TRUNCATE ON audit_events
    FOR EACH STATEMENT EXECUTE FUNCTION audit_events_refuse_change()`)
  await sequelize.query(`REVOKE UPDATE, DELETE, TRUNCATE ON audit_events FROM ${role}`)
}

export async function down({ context: { sequelize } }: { context: MigrationContext }) {
  await sequelize.query('DROP TABLE audit_events')
  await sequelize.query('DROP FUNCTION audit_events_refuse_change()')
}
