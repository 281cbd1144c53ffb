'use strict';

/** Exam types, rooms, scanners and probes: the clinic's catalog. */
/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface, Sequelize) {
    const t = { charset: 'utf8mb4', collate: 'utf8mb4_unicode_ci', engine: 'InnoDB' };
    const stamps = {
      created_at: { type: Sequelize.DATE, allowNull: false },
      updated_at: { type: Sequelize.DATE, allowNull: false },
    };
    const probeKind = Sequelize.ENUM('linear', 'curvilinear', 'phased-array');

    await queryInterface.createTable(
      'exam_types',
      {
        id: { type: Sequelize.INTEGER, autoIncrement: true, primaryKey: true },
        code: { type: Sequelize.STRING(40), allowNull: false, unique: true },
        name: { type: Sequelize.STRING(120), allowNull: false },
        template_id: { type: Sequelize.STRING(40), allowNull: false },
        duration_minutes: { type: Sequelize.INTEGER, allowNull: false },
        probe_kind: { type: probeKind, allowNull: false },
        preparation_text: { type: Sequelize.TEXT, allowNull: false },
        self_pay_price_cents: { type: Sequelize.INTEGER, allowNull: false },
        deposit_cents: { type: Sequelize.INTEGER, allowNull: false },
        currency: { type: Sequelize.CHAR(3), allowNull: false },
        active: { type: Sequelize.BOOLEAN, allowNull: false, defaultValue: true },
        ...stamps,
      },
      t,
    );

    await queryInterface.createTable(
      'rooms',
      {
        id: { type: Sequelize.INTEGER, autoIncrement: true, primaryKey: true },
        name: { type: Sequelize.STRING(80), allowNull: false, unique: true },
        active: { type: Sequelize.BOOLEAN, allowNull: false, defaultValue: true },
        ...stamps,
      },
      t,
    );

    await queryInterface.createTable(
      'scanners',
      {
        id: { type: Sequelize.INTEGER, autoIncrement: true, primaryKey: true },
        room_id: {
          type: Sequelize.INTEGER,
          allowNull: false,
          references: { model: 'rooms', key: 'id' },
          onUpdate: 'CASCADE',
          onDelete: 'RESTRICT',
        },
        name: { type: Sequelize.STRING(80), allowNull: false },
        ae_title: { type: Sequelize.STRING(16), allowNull: false, unique: true },
        active: { type: Sequelize.BOOLEAN, allowNull: false, defaultValue: true },
        ...stamps,
      },
      t,
    );

    await queryInterface.createTable(
      'probes',
      {
        id: { type: Sequelize.INTEGER, autoIncrement: true, primaryKey: true },
        scanner_id: {
          type: Sequelize.INTEGER,
          allowNull: true,
          references: { model: 'scanners', key: 'id' },
          onUpdate: 'CASCADE',
          onDelete: 'SET NULL',
        },
        kind: { type: probeKind, allowNull: false },
        model_label: { type: Sequelize.STRING(80), allowNull: false },
        serial_number: { type: Sequelize.STRING(60), allowNull: false, unique: true },
        min_frequency_mhz: { type: Sequelize.FLOAT, allowNull: false },
        max_frequency_mhz: { type: Sequelize.FLOAT, allowNull: false },
        endocavitary: { type: Sequelize.BOOLEAN, allowNull: false, defaultValue: false },
        in_service_from: { type: Sequelize.DATEONLY, allowNull: false },
        in_service_to: { type: Sequelize.DATEONLY, allowNull: true },
        ...stamps,
      },
      t,
    );
  },

  async down(queryInterface) {
    await queryInterface.dropTable('probes');
    await queryInterface.dropTable('scanners');
    await queryInterface.dropTable('rooms');
    await queryInterface.dropTable('exam_types');
  },
};
