'use strict';

/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface, Sequelize) {
    await queryInterface.createTable(
      'patients',
      {
        id: { type: Sequelize.INTEGER, autoIncrement: true, primaryKey: true },
        mrn: { type: Sequelize.STRING(20), allowNull: false, unique: true },
        family_name: { type: Sequelize.STRING(100), allowNull: false },
        given_name: { type: Sequelize.STRING(100), allowNull: false },
        birth_date: { type: Sequelize.DATEONLY, allowNull: false },
        sex: { type: Sequelize.ENUM('female', 'male', 'other', 'unknown'), allowNull: false },
        email: { type: Sequelize.STRING(254), allowNull: true },
        phone: { type: Sequelize.STRING(40), allowNull: true },
        address_line: { type: Sequelize.STRING(200), allowNull: true },
        city: { type: Sequelize.STRING(100), allowNull: true },
        postal_code: { type: Sequelize.STRING(20), allowNull: true },
        version: { type: Sequelize.INTEGER, allowNull: false, defaultValue: 0 },
        created_at: { type: Sequelize.DATE, allowNull: false },
        updated_at: { type: Sequelize.DATE, allowNull: false },
      },
      { charset: 'utf8mb4', collate: 'utf8mb4_unicode_ci', engine: 'InnoDB' },
    );
    // Search by name (prefix) and by birth date; both also drive duplicate detection.
    await queryInterface.addIndex('patients', ['family_name', 'given_name'], { name: 'patients_name' });
    await queryInterface.addIndex('patients', ['birth_date'], { name: 'patients_birth_date' });
  },

  async down(queryInterface) {
    await queryInterface.dropTable('patients');
  },
};
