'use strict';

/**
 * Named counters for identifiers that must be unique and never reused (MRNs, accession numbers
 * per day). A use-case locks its counter row (SELECT … FOR UPDATE) inside its own transaction,
 * so concurrent bookings queue on the row instead of colliding.
 */
/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface, Sequelize) {
    await queryInterface.createTable(
      'sequences',
      {
        name: { type: Sequelize.STRING(60), primaryKey: true },
        last_value: { type: Sequelize.BIGINT, allowNull: false, defaultValue: 0 },
        updated_at: { type: Sequelize.DATE, allowNull: false },
      },
      { charset: 'utf8mb4', collate: 'utf8mb4_unicode_ci', engine: 'InnoDB' },
    );
  },

  async down(queryInterface) {
    await queryInterface.dropTable('sequences');
  },
};
