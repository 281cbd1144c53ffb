'use strict';

/**
 * What may be added to a report after the physician's text: signed addenda (corrections once a
 * report is final) and the record of urgent findings communicated directly to a clinician (who
 * was told, when, how, and whether they read the finding back). Both are written once and kept:
 * the triggers refuse any UPDATE or DELETE, so the record stays what was signed or recorded.
 *
 * A patient's exams are indexed by date, for the comparison with prior exams.
 *
 * The outbox learns which report's PDF to attach to an e-mail (when the clinic allows it); the
 * PDF is rendered when the e-mail is sent, never stored in the outbox.
 */

const keep = (table) => [
  `CREATE TRIGGER ${table}_kept_on_update BEFORE UPDATE ON ${table} FOR EACH ROW
   BEGIN SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'This record is part of a report and cannot be changed.'; END`,
  `CREATE TRIGGER ${table}_kept_on_delete BEFORE DELETE ON ${table} FOR EACH ROW
   BEGIN SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'This record is part of a report and cannot be deleted.'; END`,
];

/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface, Sequelize) {
    const fk = (table, allowNull = false) => ({ type: Sequelize.INTEGER, allowNull, references: { model: table, key: 'id' }, onUpdate: 'RESTRICT', onDelete: 'RESTRICT' });
    await queryInterface.createTable('report_addenda', {
      id: { type: Sequelize.INTEGER, autoIncrement: true, primaryKey: true },
      report_id: fk('reports'),
      body_html: { type: Sequelize.TEXT, allowNull: false },
      signed_by: fk('users'),
      signed_at: { type: Sequelize.DATE(3), allowNull: false },
      /** sha256 of the addendum's canonical content, which includes the hash it follows. */
      signed_hash: { type: Sequelize.CHAR(64), allowNull: false },
      created_at: { type: Sequelize.DATE, allowNull: false },
    });
    await queryInterface.addIndex('report_addenda', ['report_id', 'signed_at'], { name: 'report_addenda_report' });

    await queryInterface.createTable('report_communications', {
      id: { type: Sequelize.INTEGER, autoIncrement: true, primaryKey: true },
      report_id: fk('reports'),
      /** The engine's prompt it answers, if any (e.g. "aaa-repair-threshold"). */
      rule_id: { type: Sequelize.STRING(60), allowNull: true },
      finding: { type: Sequelize.STRING(500), allowNull: false },
      recipient_name: { type: Sequelize.STRING(200), allowNull: false },
      recipient_role: { type: Sequelize.STRING(120), allowNull: true },
      method: { type: Sequelize.ENUM('telephone', 'in-person', 'video-call', 'secure-message'), allowNull: false },
      communicated_at: { type: Sequelize.DATE, allowNull: false },
      read_back: { type: Sequelize.BOOLEAN, allowNull: false },
      recorded_by: fk('users'),
      created_at: { type: Sequelize.DATE, allowNull: false },
    });
    await queryInterface.addIndex('report_communications', ['report_id', 'communicated_at'], { name: 'report_communications_report' });

    for (const sql of [...keep('report_addenda'), ...keep('report_communications')]) await queryInterface.sequelize.query(sql);

    await queryInterface.addColumn('outbox', 'attach_report_id', fk('reports', true));
    // A patient's earlier exams, newest first: the priors a report is compared with.
    await queryInterface.addIndex('exams', ['patient_id', 'scheduled_start'], { name: 'exams_patient_start' });
  },

  async down(queryInterface) {
    // The foreign key on patient_id may have adopted the new index: give it its own first.
    await queryInterface.addIndex('exams', ['patient_id'], { name: 'exams_patient' });
    await queryInterface.removeIndex('exams', 'exams_patient_start');
    await queryInterface.removeColumn('outbox', 'attach_report_id');
    for (const t of ['report_communications', 'report_addenda']) {
      await queryInterface.sequelize.query(`DROP TRIGGER IF EXISTS ${t}_kept_on_update`);
      await queryInterface.sequelize.query(`DROP TRIGGER IF EXISTS ${t}_kept_on_delete`);
      await queryInterface.dropTable(t);
    }
  },
};
