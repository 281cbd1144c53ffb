'use strict';

/**
 * One report per exam. It keeps the template version and reference-set version it was
 * evaluated with, the sonographer's entries as entered, and the server's evaluation of them,
 * so an old report reads exactly as it was written.
 */
/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface, Sequelize) {
    const fk = (table, allowNull) => ({ type: Sequelize.INTEGER, allowNull, references: { model: table, key: 'id' }, onUpdate: 'CASCADE', onDelete: 'RESTRICT' });
    await queryInterface.createTable(
      'reports',
      {
        id: { type: Sequelize.INTEGER, autoIncrement: true, primaryKey: true },
        exam_id: { ...fk('exams', false), unique: true },
        template_id: { type: Sequelize.STRING(40), allowNull: false },
        template_version: { type: Sequelize.STRING(20), allowNull: false },
        reference_set_version: { type: Sequelize.STRING(80), allowNull: false },
        status: { type: Sequelize.ENUM('draft', 'preliminary', 'final', 'amended'), allowNull: false, defaultValue: 'draft' },
        measurements: { type: Sequelize.JSON, allowNull: false },
        nodules: { type: Sequelize.JSON, allowNull: false },
        height_cm: { type: Sequelize.DOUBLE, allowNull: true },
        weight_kg: { type: Sequelize.DOUBLE, allowNull: true },
        probe_id: fk('probes', true),
        probe_kind: { type: Sequelize.ENUM('linear', 'curvilinear', 'phased-array'), allowNull: true },
        // The engine's answer for the stored entries: derived values, flags, findings, prompts.
        evaluation: { type: Sequelize.JSON, allowNull: true },
        findings_text: { type: Sequelize.TEXT, allowNull: true },
        impression_text: { type: Sequelize.TEXT, allowNull: true },
        abnormal_count: { type: Sequelize.INTEGER, allowNull: false, defaultValue: 0 },
        created_by: fk('users', true),
        updated_by: fk('users', true),
        submitted_by: fk('users', true),
        submitted_at: { type: Sequelize.DATE, allowNull: true },
        version: { type: Sequelize.INTEGER, allowNull: false, defaultValue: 0 },
        created_at: { type: Sequelize.DATE, allowNull: false },
        updated_at: { type: Sequelize.DATE, allowNull: false },
      },
      { charset: 'utf8mb4', collate: 'utf8mb4_unicode_ci', engine: 'InnoDB' },
    );
    // The reading queue asks for preliminary reports, oldest first.
    await queryInterface.addIndex('reports', ['status', 'submitted_at'], { name: 'reports_status_submitted' });
  },

  async down(queryInterface) {
    await queryInterface.dropTable('reports');
  },
};
