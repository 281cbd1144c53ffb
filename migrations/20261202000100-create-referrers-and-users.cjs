'use strict';

/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface, Sequelize) {
    const t = { charset: 'utf8mb4', collate: 'utf8mb4_unicode_ci', engine: 'InnoDB' };
    await queryInterface.createTable(
      'referrers',
      {
        id: { type: Sequelize.INTEGER, autoIncrement: true, primaryKey: true },
        name: { type: Sequelize.STRING(160), allowNull: false },
        practice: { type: Sequelize.STRING(160), allowNull: false },
        email: { type: Sequelize.STRING(254), allowNull: false, unique: true },
        phone: { type: Sequelize.STRING(40), allowNull: true },
        active: { type: Sequelize.BOOLEAN, allowNull: false, defaultValue: true },
        version: { type: Sequelize.INTEGER, allowNull: false, defaultValue: 0 },
        created_at: { type: Sequelize.DATE, allowNull: false },
        updated_at: { type: Sequelize.DATE, allowNull: false },
      },
      t,
    );
    await queryInterface.addIndex('referrers', ['name'], { name: 'referrers_name' });

    await queryInterface.createTable(
      'users',
      {
        id: { type: Sequelize.INTEGER, autoIncrement: true, primaryKey: true },
        email: { type: Sequelize.STRING(254), allowNull: false, unique: true },
        display_name: { type: Sequelize.STRING(120), allowNull: false },
        role: {
          type: Sequelize.ENUM('admin', 'frontdesk', 'sonographer', 'radiologist', 'referrer'),
          allowNull: false,
        },
        password_hash: { type: Sequelize.STRING(255), allowNull: false },
        active: { type: Sequelize.BOOLEAN, allowNull: false, defaultValue: true },
        failed_sign_ins: { type: Sequelize.INTEGER, allowNull: false, defaultValue: 0 },
        locked_until: { type: Sequelize.DATE, allowNull: true },
        last_sign_in_at: { type: Sequelize.DATE, allowNull: true },
        referrer_id: {
          type: Sequelize.INTEGER,
          allowNull: true,
          references: { model: 'referrers', key: 'id' },
          onUpdate: 'CASCADE',
          onDelete: 'RESTRICT',
        },
        version: { type: Sequelize.INTEGER, allowNull: false, defaultValue: 0 },
        created_at: { type: Sequelize.DATE, allowNull: false },
        updated_at: { type: Sequelize.DATE, allowNull: false },
      },
      t,
    );
    await queryInterface.addIndex('users', ['role', 'active'], { name: 'users_role_active' });
  },

  async down(queryInterface) {
    await queryInterface.dropTable('users');
    await queryInterface.dropTable('referrers');
  },
};
