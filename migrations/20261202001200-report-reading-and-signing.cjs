'use strict';

/**
 * Reading and signing: who is reading a preliminary report (the claim), the physician's findings
 * and impression as sanitized HTML, and the signature (signer, time, sha256 of the signed
 * content).
 *
 * A signed report never changes again, and the database says so too, not only the API: the
 * trigger below refuses any UPDATE that touches a signed report's content or signature, and any
 * DELETE of a signed report. What may still change on a signed report is its status (final →
 * amended, by an addendum), its version and who last touched it.
 */

const CONTENT = [
  'exam_id', 'template_id', 'template_version', 'reference_set_version', 'measurements', 'nodules', 'height_cm', 'weight_kg',
  'probe_id', 'probe_kind', 'evaluation', 'findings_text', 'findings_html', 'impression_html', 'abnormal_count',
  'submitted_by', 'submitted_at', 'signed_by', 'signed_at', 'signed_hash',
];

const GUARD_UPDATE = `
CREATE TRIGGER reports_signed_is_final BEFORE UPDATE ON reports FOR EACH ROW
BEGIN
  IF OLD.signed_at IS NOT NULL AND NOT (${CONTENT.map((c) => `NEW.${c} <=> OLD.${c}`).join(' AND ')}) THEN
    SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'A signed report cannot be changed; write an addendum.';
  END IF;
  IF OLD.signed_at IS NOT NULL AND NEW.status NOT IN ('final', 'amended') THEN
    SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'A signed report cannot be changed; write an addendum.';
  END IF;
END`;

const GUARD_DELETE = `
CREATE TRIGGER reports_signed_kept BEFORE DELETE ON reports FOR EACH ROW
BEGIN
  IF OLD.signed_at IS NOT NULL THEN
    SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'A signed report cannot be deleted.';
  END IF;
END`;

/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface, Sequelize) {
    const fk = { type: Sequelize.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onUpdate: 'RESTRICT', onDelete: 'RESTRICT' };
    await queryInterface.renameColumn('reports', 'impression_text', 'impression_html');
    await queryInterface.addColumn('reports', 'findings_html', { type: Sequelize.TEXT, allowNull: true });
    await queryInterface.addColumn('reports', 'claimed_by', fk);
    await queryInterface.addColumn('reports', 'claimed_at', { type: Sequelize.DATE, allowNull: true });
    await queryInterface.addColumn('reports', 'signed_by', fk);
    await queryInterface.addColumn('reports', 'signed_at', { type: Sequelize.DATE(3), allowNull: true });
    await queryInterface.addColumn('reports', 'signed_hash', { type: Sequelize.CHAR(64), allowNull: true });
    await queryInterface.sequelize.query(GUARD_UPDATE);
    await queryInterface.sequelize.query(GUARD_DELETE);
  },

  async down(queryInterface) {
    await queryInterface.sequelize.query('DROP TRIGGER IF EXISTS reports_signed_kept');
    await queryInterface.sequelize.query('DROP TRIGGER IF EXISTS reports_signed_is_final');
    for (const c of ['signed_hash', 'signed_at', 'signed_by', 'claimed_at', 'claimed_by', 'findings_html']) await queryInterface.removeColumn('reports', c);
    await queryInterface.renameColumn('reports', 'impression_html', 'impression_text');
  },
};
