'use strict';

/**
 * What the scanners send over DICOM: procedure steps (MPPS) that move an exam's status, and
 * measurements read from structured reports, offered to the sonographer field by field.
 * Objects themselves land in `attachments` (source 'network'); an object that matches no exam
 * waits there unmatched (the holding list), with the reason it was held.
 */
/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface, Sequelize) {
    const t = { charset: 'utf8mb4', collate: 'utf8mb4_unicode_ci', engine: 'InnoDB' };
    const fk = (table, allowNull) => ({ type: Sequelize.INTEGER, allowNull, references: { model: table, key: 'id' }, onUpdate: 'RESTRICT', onDelete: 'RESTRICT' });

    await queryInterface.createTable(
      'procedure_steps',
      {
        id: { type: Sequelize.INTEGER, autoIncrement: true, primaryKey: true },
        // The MPPS instance the scanner created; N-SET names it.
        sop_instance_uid: { type: Sequelize.STRING(64), allowNull: false, unique: true },
        exam_id: fk('exams', false),
        scanner_ae: { type: Sequelize.STRING(16), allowNull: false },
        status: { type: Sequelize.ENUM('in-progress', 'completed', 'discontinued'), allowNull: false },
        started_at: { type: Sequelize.DATE, allowNull: true },
        ended_at: { type: Sequelize.DATE, allowNull: true },
        discontinued_reason: { type: Sequelize.STRING(200), allowNull: true },
        created_at: { type: Sequelize.DATE, allowNull: false },
        updated_at: { type: Sequelize.DATE, allowNull: false },
      },
      t,
    );
    await queryInterface.addIndex('procedure_steps', ['exam_id'], { name: 'procedure_steps_exam' });

    await queryInterface.createTable(
      'scanner_values',
      {
        id: { type: Sequelize.INTEGER, autoIncrement: true, primaryKey: true },
        exam_id: fk('exams', false),
        attachment_id: fk('attachments', false),
        field_code: { type: Sequelize.STRING(60), allowNull: false },
        // In the template field's unit, after conversion.
        value: { type: Sequelize.DOUBLE, allowNull: false },
        // As the scanner sent it: concept code (scheme:value), its meaning, the number and UCUM unit.
        concept: { type: Sequelize.STRING(80), allowNull: false },
        concept_meaning: { type: Sequelize.STRING(120), allowNull: false },
        source_value: { type: Sequelize.STRING(40), allowNull: false },
        source_unit: { type: Sequelize.STRING(40), allowNull: false },
        state: { type: Sequelize.ENUM('offered', 'accepted', 'rejected'), allowNull: false, defaultValue: 'offered' },
        decided_by: fk('users', true),
        decided_at: { type: Sequelize.DATE, allowNull: true },
        created_at: { type: Sequelize.DATE, allowNull: false },
        updated_at: { type: Sequelize.DATE, allowNull: false },
      },
      t,
    );
    await queryInterface.addIndex('scanner_values', ['attachment_id', 'field_code'], { name: 'scanner_values_object_field', unique: true });
    await queryInterface.addIndex('scanner_values', ['exam_id', 'state'], { name: 'scanner_values_exam_state' });

    await queryInterface.addColumn('attachments', 'received_from', { type: Sequelize.STRING(16), allowNull: true });
    await queryInterface.addColumn('attachments', 'held_reason', { type: Sequelize.STRING(255), allowNull: true });
    // Where each entered value came from, by field code: 'scanner' (a structured report) or 'image' (calipers).
    await queryInterface.addColumn('reports', 'measurement_sources', { type: Sequelize.JSON, allowNull: true });
  },

  async down(queryInterface) {
    await queryInterface.removeColumn('reports', 'measurement_sources');
    await queryInterface.removeColumn('attachments', 'held_reason');
    await queryInterface.removeColumn('attachments', 'received_from');
    await queryInterface.dropTable('scanner_values');
    await queryInterface.dropTable('procedure_steps');
  },
};
