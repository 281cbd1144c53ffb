'use strict';

/**
 * Reference ranges with their provenance. Rows are never edited in place: a new edition is a
 * new reference set (version) beside the old one, so a stored report reads as it was signed.
 */
/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface, Sequelize) {
    await queryInterface.createTable(
      'reference_ranges',
      {
        id: { type: Sequelize.INTEGER, autoIncrement: true, primaryKey: true },
        reference_set: { type: Sequelize.STRING(40), allowNull: false },
        row_key: { type: Sequelize.STRING(80), allowNull: false },
        code: { type: Sequelize.STRING(60), allowNull: false },
        label: { type: Sequelize.STRING(120), allowNull: false },
        sex: { type: Sequelize.ENUM('male', 'female', 'any'), allowNull: false },
        age_min_years: { type: Sequelize.INTEGER, allowNull: true },
        age_max_years: { type: Sequelize.INTEGER, allowNull: true },
        unit: { type: Sequelize.STRING(20), allowNull: false },
        decimals: { type: Sequelize.TINYINT, allowNull: false },
        normal_min: { type: Sequelize.DOUBLE, allowNull: true },
        normal_max: { type: Sequelize.DOUBLE, allowNull: true },
        severity_direction: { type: Sequelize.ENUM('low', 'high'), allowNull: true },
        mild_limit: { type: Sequelize.DOUBLE, allowNull: true },
        moderate_limit: { type: Sequelize.DOUBLE, allowNull: true },
        source: { type: Sequelize.STRING(300), allowNull: false },
        provenance: { type: Sequelize.ENUM('SRC+', 'SRC~', 'CP', 'MEM'), allowNull: false },
        note: { type: Sequelize.TEXT, allowNull: true },
        created_at: { type: Sequelize.DATE, allowNull: false },
      },
      { charset: 'utf8mb4', collate: 'utf8mb4_unicode_ci', engine: 'InnoDB' },
    );
    await queryInterface.addIndex('reference_ranges', ['reference_set', 'row_key'], { unique: true, name: 'reference_ranges_set_key' });
    await queryInterface.addIndex('reference_ranges', ['reference_set', 'code'], { name: 'reference_ranges_set_code' });
  },

  async down(queryInterface) {
    await queryInterface.dropTable('reference_ranges');
  },
};
