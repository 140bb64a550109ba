import type { Knex } from "knex";

// The audit trail is append-only: the database refuses UPDATE always, and DELETE except when
// foreign key checks are switched off for a whole-database reset (seeds/00_reset.ts does that).
export async function up(knex: Knex) {
  await knex.raw(`CREATE TRIGGER notice_audit_no_update BEFORE UPDATE ON notice_audit FOR EACH ROW
    SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'notice_audit is append-only'`);
  await knex.raw(`CREATE TRIGGER notice_audit_no_delete BEFORE DELETE ON notice_audit FOR EACH ROW
    BEGIN
      IF @@foreign_key_checks = 1 THEN
        SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'notice_audit is append-only';
      END IF;
    END`);
}

export async function down(knex: Knex) {
  await knex.raw("DROP TRIGGER IF EXISTS notice_audit_no_delete");
  await knex.raw("DROP TRIGGER IF EXISTS notice_audit_no_update");
}
