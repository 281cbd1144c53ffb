'use strict';

/**
 * Links to a final report, e-mailed to the referring clinician on signing and on each addendum.
 * Only the sha256 of the random token is kept; a link expires, and every opening is counted here
 * and written to the audit log.
 */
/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface, Sequelize) {
    const fk = (table) => ({ type: Sequelize.INTEGER, allowNull: false, references: { model: table, key: 'id' }, onUpdate: 'RESTRICT', onDelete: 'RESTRICT' });
    await queryInterface.createTable('report_links', {
      id: { type: Sequelize.INTEGER, autoIncrement: true, primaryKey: true },
      report_id: fk('reports'),
      referrer_id: fk('referrers'),
      token_hash: { type: Sequelize.CHAR(64), allowNull: false, unique: true },
      reason: { type: Sequelize.ENUM('final', 'addendum'), allowNull: false },
      expires_at: { type: Sequelize.DATE, allowNull: false },
      first_opened_at: { type: Sequelize.DATE, allowNull: true },
      last_opened_at: { type: Sequelize.DATE, allowNull: true },
      open_count: { type: Sequelize.INTEGER, allowNull: false, defaultValue: 0 },
      created_at: { type: Sequelize.DATE, allowNull: false },
    });
    await queryInterface.addIndex('report_links', ['report_id'], { name: 'report_links_report' });
  },

  async down(queryInterface) {
    await queryInterface.dropTable('report_links');
  },
};
