import type { Knex } from 'knex';

const ROLES = ['proposer', 'reviewer', 'facility_manager', 'billing_contact', 'administrator'];

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('accounts', (t) => {
    t.increments('id').primary();
    t.text('email').notNullable();
    t.text('display_name').notNullable();
    t.text('affiliation').notNullable().defaultTo('');
    t.text('password_hash').notNullable();
    t.timestamp('disabled_at', { useTz: true });
    t.timestamp('last_sign_in_at', { useTz: true });
    t.timestamps(true, true);
  });
  // One account per address whatever its case.
  await knex.raw('CREATE UNIQUE INDEX accounts_email_lower_unique ON accounts (lower(email))');

  await knex.schema.createTable('account_roles', (t) => {
    t.integer('account_id').notNullable().references('accounts.id').onDelete('CASCADE');
    t.text('role').notNullable();
    t.integer('granted_by').references('accounts.id').onDelete('SET NULL');
    t.timestamp('granted_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.primary(['account_id', 'role']);
  });
  await knex.raw(
    `ALTER TABLE account_roles ADD CONSTRAINT account_roles_role_check CHECK (role IN (${ROLES.map((r) => `'${r}'`).join(', ')}))`,
  );

  await knex.schema.createTable('password_reset_tokens', (t) => {
    t.increments('id').primary();
    t.integer('account_id').notNullable().references('accounts.id').onDelete('CASCADE');
    // Only a SHA-256 of the token is stored: a database leak does not leak usable links.
    t.text('token_hash').notNullable().unique();
    t.timestamp('expires_at', { useTz: true }).notNullable();
    t.timestamp('used_at', { useTz: true });
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(['account_id']);
  });

  // Table layout required by connect-pg-simple (express-session store).
  await knex.schema.createTable('sessions', (t) => {
    t.string('sid').primary();
    t.json('sess').notNullable();
    t.timestamp('expire', { precision: 6, useTz: false }).notNullable().index('sessions_expire_index');
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('sessions');
  await knex.schema.dropTable('password_reset_tokens');
  await knex.schema.dropTable('account_roles');
  await knex.schema.dropTable('accounts');
}
