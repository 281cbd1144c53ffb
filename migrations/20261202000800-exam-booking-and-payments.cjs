'use strict';

/**
 * Booking and money: who pays, when an exam ends (for clash checks), the payment state the
 * worklist shows, the payment ledger, and the provider events already handled.
 */
/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface, Sequelize) {
    const t = { charset: 'utf8mb4', collate: 'utf8mb4_unicode_ci', engine: 'InnoDB' };
    await queryInterface.addColumn('exams', 'scheduled_end', { type: Sequelize.DATE, allowNull: true });
    await queryInterface.sequelize.query('UPDATE exams SET scheduled_end = DATE_ADD(scheduled_start, INTERVAL duration_minutes MINUTE)');
    await queryInterface.changeColumn('exams', 'scheduled_end', { type: Sequelize.DATE, allowNull: false });
    await queryInterface.addColumn('exams', 'payer', { type: Sequelize.ENUM('self-pay', 'insured'), allowNull: false, defaultValue: 'self-pay' });
    await queryInterface.addColumn('exams', 'deposit_cents', { type: Sequelize.INTEGER, allowNull: false, defaultValue: 0 });
    await queryInterface.addColumn('exams', 'payment_state', {
      type: Sequelize.ENUM('none', 'deposit-due', 'deposit-paid', 'paid', 'refund-due', 'refunded', 'deposit-kept'),
      allowNull: false,
      defaultValue: 'none',
    });
    await queryInterface.addColumn('exams', 'reminder_queued_at', { type: Sequelize.DATE, allowNull: true });
    await queryInterface.addColumn('exams', 'created_by', { type: Sequelize.INTEGER, allowNull: true });

    await queryInterface.createTable(
      'payments',
      {
        id: { type: Sequelize.INTEGER, autoIncrement: true, primaryKey: true },
        exam_id: { type: Sequelize.INTEGER, allowNull: false, references: { model: 'exams', key: 'id' }, onUpdate: 'CASCADE', onDelete: 'RESTRICT' },
        kind: { type: Sequelize.ENUM('deposit', 'balance', 'refund'), allowNull: false },
        amount_cents: { type: Sequelize.INTEGER, allowNull: false },
        currency: { type: Sequelize.CHAR(3), allowNull: false },
        status: { type: Sequelize.ENUM('pending', 'succeeded', 'failed', 'canceled'), allowNull: false, defaultValue: 'pending' },
        // Sent with every provider call for this row, so a retried request never charges twice.
        idempotency_key: { type: Sequelize.STRING(64), allowNull: false, unique: true },
        // The payment method sent with the key: a retry must send exactly the same request.
        payment_method: { type: Sequelize.STRING(80), allowNull: true },
        provider_intent_id: { type: Sequelize.STRING(80), allowNull: true },
        provider_refund_id: { type: Sequelize.STRING(80), allowNull: true },
        refund_of_id: { type: Sequelize.INTEGER, allowNull: true, references: { model: 'payments', key: 'id' }, onUpdate: 'CASCADE', onDelete: 'RESTRICT' },
        failure_code: { type: Sequelize.STRING(60), allowNull: true },
        failure_message: { type: Sequelize.STRING(300), allowNull: true },
        attempts: { type: Sequelize.INTEGER, allowNull: false, defaultValue: 0 },
        created_by: { type: Sequelize.INTEGER, allowNull: true },
        created_at: { type: Sequelize.DATE, allowNull: false },
        updated_at: { type: Sequelize.DATE, allowNull: false },
      },
      t,
    );
    await queryInterface.addIndex('payments', ['exam_id'], { name: 'payments_exam' });
    await queryInterface.addIndex('payments', ['provider_intent_id'], { name: 'payments_intent' });
    await queryInterface.addIndex('payments', ['status', 'kind'], { name: 'payments_status_kind' });

    await queryInterface.createTable(
      'payment_events',
      {
        id: { type: Sequelize.INTEGER, autoIncrement: true, primaryKey: true },
        provider_event_id: { type: Sequelize.STRING(80), allowNull: false, unique: true },
        type: { type: Sequelize.STRING(60), allowNull: false },
        outcome: { type: Sequelize.STRING(60), allowNull: false },
        received_at: { type: Sequelize.DATE, allowNull: false },
      },
      t,
    );
    await queryInterface.addIndex('exams', ['payment_state', 'scheduled_start'], { name: 'exams_payment_start' });
  },

  async down(queryInterface) {
    await queryInterface.removeIndex('exams', 'exams_payment_start');
    await queryInterface.dropTable('payment_events');
    await queryInterface.dropTable('payments');
    for (const column of ['created_by', 'reminder_queued_at', 'payment_state', 'deposit_cents', 'payer', 'scheduled_end']) {
      await queryInterface.removeColumn('exams', column);
    }
  },
};
