import type { Knex } from 'knex'

export async function up(knex: Knex): Promise<void> {
  // Archived sets and classes drop out of the teacher's working lists but keep their history.
  await knex.schema.alterTable('drill_sets', (t) => {
    t.timestamp('archived_at', { precision: 3 }).nullable()
  })
  await knex.schema.alterTable('classes', (t) => {
    t.timestamp('archived_at', { precision: 3 }).nullable()
  })
  // The teacher picks a calendar day in their own time zone; due_at is the end of that day there,
  // so "overdue" means the same moment for every student wherever the server runs.
  await knex.schema.alterTable('assignments', (t) => {
    t.date('due_on').nullable()
    t.string('time_zone', 64).nullable()
  })
  // The invitation's link token now lives in one_time_tokens (kind "invitation", subject = the invitation's id),
  // beside the other e-mailed links; the invitation keeps its own state for the teacher's list.
  await knex.schema.alterTable('invitations', (t) => {
    t.dropUnique(['token_hash'])
  })
  await knex.schema.alterTable('invitations', (t) => {
    t.dropColumn('token_hash')
    t.bigInteger('invited_by').unsigned().nullable().references('users.id').onDelete('SET NULL')
    t.bigInteger('accepted_by').unsigned().nullable().references('users.id').onDelete('SET NULL')
    t.timestamp('revoked_at', { precision: 3 }).nullable()
    t.timestamp('sent_at', { precision: 3 }).nullable()
  })
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('invitations', (t) => {
    t.dropForeign(['invited_by'])
    t.dropForeign(['accepted_by'])
  })
  await knex.schema.alterTable('invitations', (t) => {
    t.dropColumn('invited_by')
    t.dropColumn('accepted_by')
    t.dropColumn('revoked_at')
    t.dropColumn('sent_at')
    t.specificType('token_hash', 'CHAR(64)').nullable().unique()
  })
  await knex.schema.alterTable('assignments', (t) => {
    t.dropColumn('due_on')
    t.dropColumn('time_zone')
  })
  await knex.schema.alterTable('classes', (t) => {
    t.dropColumn('archived_at')
  })
  await knex.schema.alterTable('drill_sets', (t) => {
    t.dropColumn('archived_at')
  })
}
