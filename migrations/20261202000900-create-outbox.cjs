'use strict';

/**
 * Outgoing e-mail. A use-case writes its message here inside its own transaction; the worker
 * sends it later with retries, so a mail server that is down delays mail but never loses it
 * and never fails the booking that caused it.
 */
/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface, Sequelize) {
    await queryInterface.createTable(
      'outbox',
      {
        id: { type: Sequelize.INTEGER, autoIncrement: true, primaryKey: true },
        kind: { type: Sequelize.STRING(40), allowNull: false },
        // e.g. "reminder:123": one reminder per exam, however often the worker looks.
        dedupe_key: { type: Sequelize.STRING(100), allowNull: true, unique: true },
        exam_id: { type: Sequelize.INTEGER, allowNull: true, references: { model: 'exams', key: 'id' }, onUpdate: 'CASCADE', onDelete: 'SET NULL' },
        to_address: { type: Sequelize.STRING(254), allowNull: false },
        subject: { type: Sequelize.STRING(200), allowNull: false },
        text_body: { type: Sequelize.TEXT, allowNull: false },
        html_body: { type: Sequelize.TEXT('medium'), allowNull: false },
        status: { type: Sequelize.ENUM('pending', 'sent', 'failed'), allowNull: false, defaultValue: 'pending' },
        attempts: { type: Sequelize.INTEGER, allowNull: false, defaultValue: 0 },
        next_attempt_at: { type: Sequelize.DATE, allowNull: false },
        claimed_by: { type: Sequelize.STRING(64), allowNull: true },
        claimed_until: { type: Sequelize.DATE, allowNull: true },
        last_error: { type: Sequelize.STRING(200), allowNull: true },
        provider_message_id: { type: Sequelize.STRING(200), allowNull: true },
        sent_at: { type: Sequelize.DATE, allowNull: true },
        created_at: { type: Sequelize.DATE, allowNull: false },
        updated_at: { type: Sequelize.DATE, allowNull: false },
      },
      { charset: 'utf8mb4', collate: 'utf8mb4_unicode_ci', engine: 'InnoDB' },
    );
    await queryInterface.addIndex('outbox', ['status', 'next_attempt_at'], { name: 'outbox_due' });
    await queryInterface.addIndex('outbox', ['exam_id'], { name: 'outbox_exam' });
  },

  async down(queryInterface) {
    await queryInterface.dropTable('outbox');
  },
};
