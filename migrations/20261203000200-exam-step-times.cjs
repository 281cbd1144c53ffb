'use strict';

/**
 * When each exam arrived, started and completed, as columns of the exam, for the manager's
 * dashboard (turnaround times) and anything else that asks "how long did it take".
 *
 * Until now these times lived only in the audit log ('exam.check-in', 'exam.start',
 * 'exam.complete'). Reading them from there for a year of exams means joining a table that grows
 * with every autosave, on a string entity id, three times per exam; and the audit log is a
 * record of who did what, not the exam's data (it may be pruned or archived one day). So the
 * services that move an exam now stamp the time on the exam itself, and this migration fills
 * the columns for earlier exams from the audit log (the first event of each kind: a scan that a
 * scanner discontinued and that started again keeps its first start).
 *
 * Covering indexes for the dashboard's reads over a period (measured on a year of 33,000 exams
 * among 100,000: reading whole rows instead cost two to three times as much):
 * - exams (scheduled_start, status, exam_type_id, room_id, duration_minutes, created_at,
 *   arrived_at, completed_at): counts by status and type, booked minutes per room and the exam's
 *   side of the turnaround times, from the index alone;
 * - reports (exam_id, submitted_at, signed_at, signed_by): the report's side of them;
 * - payments (created_at, status, kind, currency, amount_cents): takings by clinic day.
 */
const STEPS = [
  ['arrived_at', 'exam.check-in'],
  ['started_at', 'exam.start'],
  ['completed_at', 'exam.complete'],
];

/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface, Sequelize) {
    for (const [column] of STEPS) {
      await queryInterface.addColumn('exams', column, { type: Sequelize.DATE, allowNull: true });
    }
    for (const [column, action] of STEPS) {
      await queryInterface.sequelize.query(
        `UPDATE exams e
           JOIN (SELECT entity_id, MIN(at) AS at FROM audit_events WHERE entity_type = 'exam' AND action = ? GROUP BY entity_id) a
             ON a.entity_id = CAST(e.id AS CHAR)
            SET e.${column} = a.at`,
        { replacements: [action] },
      );
    }
    await queryInterface.addIndex('exams', ['scheduled_start', 'status', 'exam_type_id', 'room_id', 'duration_minutes', 'created_at', 'arrived_at', 'completed_at'], {
      name: 'exams_dashboard',
    });
    await queryInterface.addIndex('reports', ['exam_id', 'submitted_at', 'signed_at', 'signed_by'], { name: 'reports_turnaround' });
    await queryInterface.addIndex('payments', ['created_at', 'status', 'kind', 'currency', 'amount_cents'], { name: 'payments_dashboard' });
  },

  async down(queryInterface) {
    await queryInterface.removeIndex('payments', 'payments_dashboard');
    await queryInterface.removeIndex('reports', 'reports_turnaround');
    await queryInterface.removeIndex('exams', 'exams_dashboard');
    for (const [column] of [...STEPS].reverse()) await queryInterface.removeColumn('exams', column);
  },
};
