'use strict';

/**
 * The catalog is edited in the app: each catalog row gets a version for optimistic locking, so
 * a manager's save over someone else's newer change is refused (409) rather than overwriting it.
 * updated_at alone would not do: DATETIME keeps whole seconds, and two saves can share one.
 */
const TABLES = ['exam_types', 'rooms', 'scanners', 'probes'];

/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface, Sequelize) {
    for (const table of TABLES) {
      await queryInterface.addColumn(table, 'version', { type: Sequelize.INTEGER, allowNull: false, defaultValue: 0 });
    }
  },

  async down(queryInterface) {
    for (const table of [...TABLES].reverse()) {
      await queryInterface.removeColumn(table, 'version');
    }
  },
};
