import type { Knex } from 'knex';

/**
 * One row per invitation mail sent, so that inviting the same address to the same proposal
 * again can be throttled (at most one mail per address, proposal and 10 minutes), also across
 * withdrawing and re-creating the invitation, which deletes the team row. Invitation links
 * expire 14 days after they were sent: `proposal_members.invited_at` is that instant (a
 * re-invitation renews it with the token), so no column is needed for the expiry.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('proposal_invitation_mails', (t) => {
    t.increments('id').primary();
    t.integer('proposal_id').notNullable().references('proposals.id').onDelete('CASCADE');
    t.text('email').notNullable();
    t.integer('sent_by').references('accounts.id').onDelete('SET NULL');
    t.timestamp('sent_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(['sent_by']);
    t.check('char_length(email) BETWEEN 3 AND 254', [], 'proposal_invitation_mails_email_check');
  });
  await knex.raw('CREATE INDEX proposal_invitation_mails_lookup ON proposal_invitation_mails (proposal_id, lower(email), sent_at)');
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('proposal_invitation_mails');
}
