import type { Knex } from 'knex';

// Single-use links sent by e-mail: sign-up verification, password reset and invitations.
// Only the SHA-256 of the token is stored, so a copy of the database cannot be used to take
// over an account. A sign-up has no user yet: the row carries the e-mail, name and password
// hash until the link is followed, and the account is created then.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('account_tokens', (t) => {
    t.bigIncrements('id').primary();
    t.text('purpose').notNullable();
    t.text('token_hash').notNullable().unique();
    t.bigInteger('user_id').references('users.id').onDelete('CASCADE');
    t.text('email').notNullable();
    t.text('name');
    t.text('password_hash');
    t.bigInteger('created_by').references('users.id').onDelete('SET NULL');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('expires_at', { useTz: true }).notNullable();
    t.timestamp('used_at', { useTz: true });
    t.check("purpose IN ('signup','reset','invite')", [], 'account_tokens_purpose_check');
    t.check("purpose = 'signup' OR user_id IS NOT NULL", [], 'account_tokens_user_check');
    t.check("purpose <> 'signup' OR (name IS NOT NULL AND password_hash IS NOT NULL)", [], 'account_tokens_signup_check');
    t.index(['user_id', 'purpose']);
  });
  await knex.raw('CREATE INDEX account_tokens_email_lower_idx ON account_tokens (lower(email))');
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('account_tokens');
}
