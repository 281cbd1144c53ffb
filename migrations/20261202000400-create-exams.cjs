'use strict';

/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface, Sequelize) {
    const fk = (table) => ({
      type: Sequelize.INTEGER,
      references: { model: table, key: 'id' },
      onUpdate: 'CASCADE',
      onDelete: 'RESTRICT',
    });
    await queryInterface.createTable(
      'exams',
      {
        id: { type: Sequelize.INTEGER, autoIncrement: true, primaryKey: true },
        accession_number: { type: Sequelize.STRING(16), allowNull: false, unique: true },
        patient_id: { ...fk('patients'), allowNull: false },
        exam_type_id: { ...fk('exam_types'), allowNull: false },
        referrer_id: { ...fk('referrers'), allowNull: true },
        room_id: { ...fk('rooms'), allowNull: false },
        scanner_id: { ...fk('scanners'), allowNull: false },
        sonographer_id: { ...fk('users'), allowNull: false },
        scheduled_start: { type: Sequelize.DATE, allowNull: false },
        duration_minutes: { type: Sequelize.INTEGER, allowNull: false },
        status: {
          type: Sequelize.ENUM('booked', 'arrived', 'in-progress', 'completed', 'cancelled', 'noshow'),
          allowNull: false,
          defaultValue: 'booked',
        },
        priority: { type: Sequelize.ENUM('routine', 'urgent'), allowNull: false, defaultValue: 'routine' },
        indication: { type: Sequelize.TEXT, allowNull: false },
        study_instance_uid: { type: Sequelize.STRING(64), allowNull: false, unique: true },
        price_cents: { type: Sequelize.INTEGER, allowNull: false },
        currency: { type: Sequelize.CHAR(3), allowNull: false },
        cancel_reason: { type: Sequelize.STRING(500), allowNull: true },
        version: { type: Sequelize.INTEGER, allowNull: false, defaultValue: 0 },
        created_at: { type: Sequelize.DATE, allowNull: false },
        updated_at: { type: Sequelize.DATE, allowNull: false },
      },
      { charset: 'utf8mb4', collate: 'utf8mb4_unicode_ci', engine: 'InnoDB' },
    );
    // The worklist asks "this day, this room / status / sonographer"; clash checks ask
    // "this room (scanner, sonographer) around this time".
    await queryInterface.addIndex('exams', ['scheduled_start'], { name: 'exams_start' });
    await queryInterface.addIndex('exams', ['status', 'scheduled_start'], { name: 'exams_status_start' });
    await queryInterface.addIndex('exams', ['room_id', 'scheduled_start'], { name: 'exams_room_start' });
    await queryInterface.addIndex('exams', ['scanner_id', 'scheduled_start'], { name: 'exams_scanner_start' });
    await queryInterface.addIndex('exams', ['sonographer_id', 'scheduled_start'], {
      name: 'exams_sonographer_start',
    });
  },

  async down(queryInterface) {
    await queryInterface.dropTable('exams');
  },
};
