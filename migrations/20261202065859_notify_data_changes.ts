import type { Knex } from 'knex';

// App servers keep the data versions and validated sessions in memory; they LISTEN on this channel
// so a write anywhere (another server, an import, psql) reaches them at once. Payloads: the kind and
// its new version ("masts 1234"), or "sessions" when a session or a user changed (sign-out, role
// change, disabled account), which drops every server's session cache.
const CHANNEL = 'bearline_changes';

export async function up(knex: Knex): Promise<void> {
  await knex.raw(`
    CREATE OR REPLACE FUNCTION bump_data_version() RETURNS trigger LANGUAGE plpgsql AS $$
    DECLARE v bigint;
    BEGIN
      INSERT INTO data_versions (name) VALUES (TG_ARGV[0])
        ON CONFLICT (name) DO UPDATE SET version = nextval('data_versions_seq')
        RETURNING version INTO v;
      PERFORM pg_notify('${CHANNEL}', TG_ARGV[0] || ' ' || v);
      RETURN NULL;
    END $$`);
  await knex.raw(`
    CREATE FUNCTION notify_sessions_changed() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      PERFORM pg_notify('${CHANNEL}', 'sessions');
      RETURN NULL;
    END $$`);
  await knex.raw(`CREATE TRIGGER sessions_notify_changed AFTER UPDATE OR DELETE OR TRUNCATE ON sessions
    FOR EACH STATEMENT EXECUTE FUNCTION notify_sessions_changed()`);
  await knex.raw(`CREATE TRIGGER users_notify_changed AFTER UPDATE OR DELETE OR TRUNCATE ON users
    FOR EACH STATEMENT EXECUTE FUNCTION notify_sessions_changed()`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('DROP TRIGGER users_notify_changed ON users');
  await knex.raw('DROP TRIGGER sessions_notify_changed ON sessions');
  await knex.raw('DROP FUNCTION notify_sessions_changed()');
  await knex.raw(`
    CREATE OR REPLACE FUNCTION bump_data_version() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      INSERT INTO data_versions (name) VALUES (TG_ARGV[0])
        ON CONFLICT (name) DO UPDATE SET version = nextval('data_versions_seq');
      RETURN NULL;
    END $$`);
}
