'use strict';

/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface, Sequelize) {
    const t = { charset: 'utf8mb4', collate: 'utf8mb4_unicode_ci', engine: 'InnoDB' };
    await queryInterface.createTable(
      'audit_events',
      {
        id: { type: Sequelize.BIGINT, autoIncrement: true, primaryKey: true },
        at: { type: Sequelize.DATE(3), allowNull: false, defaultValue: Sequelize.literal('CURRENT_TIMESTAMP(3)') },
        // No foreign key on purpose: the audit trail outlives the rows it talks about.
        actor_user_id: { type: Sequelize.INTEGER, allowNull: true },
        action: { type: Sequelize.STRING(64), allowNull: false },
        entity_type: { type: Sequelize.STRING(40), allowNull: false },
        entity_id: { type: Sequelize.STRING(64), allowNull: true },
        detail: { type: Sequelize.JSON, allowNull: true },
        request_id: { type: Sequelize.STRING(64), allowNull: true },
      },
      t,
    );
    await queryInterface.addIndex('audit_events', ['entity_type', 'entity_id'], { name: 'audit_entity' });
    await queryInterface.addIndex('audit_events', ['at'], { name: 'audit_at' });
    await queryInterface.addIndex('audit_events', ['actor_user_id', 'at'], { name: 'audit_actor_at' });

    await queryInterface.createTable(
      'settings',
      {
        key: { type: Sequelize.STRING(80), primaryKey: true },
        value: { type: Sequelize.JSON, allowNull: false },
        updated_at: { type: Sequelize.DATE, allowNull: false },
      },
      t,
    );
  },

  async down(queryInterface) {
    await queryInterface.dropTable('settings');
    await queryInterface.dropTable('audit_events');
  },
};
