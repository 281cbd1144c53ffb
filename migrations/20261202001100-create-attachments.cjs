'use strict';

/**
 * Images and DICOM objects of an exam. Uploads land here now; objects a scanner sends over
 * the network (a later issue) land in the same table and the same file store. An object that
 * matches no exam yet waits with `match_status = 'unmatched'` and no exam (the holding list)
 * until someone assigns it; an upload is always matched, because the upload refuses a file
 * whose identifiers do not fit the exam.
 */
/** @type {import('sequelize-cli').Migration} */
module.exports = {
  async up(queryInterface, Sequelize) {
    await queryInterface.createTable(
      'attachments',
      {
        id: { type: Sequelize.INTEGER, autoIncrement: true, primaryKey: true },
        // RESTRICT on update too: MariaDB allows no CHECK on a column with a cascading key (ids never change anyway).
        exam_id: { type: Sequelize.INTEGER, allowNull: true, references: { model: 'exams', key: 'id' }, onUpdate: 'RESTRICT', onDelete: 'RESTRICT' },
        match_status: { type: Sequelize.ENUM('matched', 'unmatched'), allowNull: false, defaultValue: 'matched' },
        kind: { type: Sequelize.ENUM('dicom', 'image'), allowNull: false },
        source: { type: Sequelize.ENUM('upload', 'network'), allowNull: false },
        original_name: { type: Sequelize.STRING(255), allowNull: false },
        content_type: { type: Sequelize.STRING(100), allowNull: false },
        size_bytes: { type: Sequelize.INTEGER, allowNull: false },
        sha256: { type: Sequelize.CHAR(64), allowNull: false },
        // Where the FileStore keeps the bytes, exactly as received; one key per row, never shared.
        storage_key: { type: Sequelize.STRING(255), allowNull: false, unique: true },
        thumbnail_key: { type: Sequelize.STRING(255), allowNull: true },
        // DICOM identifiers as found in the file (padding trimmed); null for PNG and JPEG.
        patient_id: { type: Sequelize.STRING(64), allowNull: true },
        accession_number: { type: Sequelize.STRING(16), allowNull: true },
        study_instance_uid: { type: Sequelize.STRING(64), allowNull: true },
        series_instance_uid: { type: Sequelize.STRING(64), allowNull: true },
        // One row per DICOM object, however it arrived (upload or network).
        sop_instance_uid: { type: Sequelize.STRING(64), allowNull: true, unique: true },
        sop_class_uid: { type: Sequelize.STRING(64), allowNull: true },
        modality: { type: Sequelize.STRING(16), allowNull: true },
        acquired_at: { type: Sequelize.DATE, allowNull: true },
        image_rows: { type: Sequelize.INTEGER, allowNull: true },
        image_columns: { type: Sequelize.INTEGER, allowNull: true },
        frame_count: { type: Sequelize.INTEGER, allowNull: true },
        transfer_syntax_uid: { type: Sequelize.STRING(64), allowNull: true },
        uploaded_by: { type: Sequelize.INTEGER, allowNull: true, references: { model: 'users', key: 'id' }, onUpdate: 'CASCADE', onDelete: 'RESTRICT' },
        created_at: { type: Sequelize.DATE, allowNull: false },
        updated_at: { type: Sequelize.DATE, allowNull: false },
      },
      { charset: 'utf8mb4', collate: 'utf8mb4_unicode_ci', engine: 'InnoDB' },
    );
    // The same bytes twice on one exam is a duplicate upload, recognised by this key.
    await queryInterface.addIndex('attachments', ['exam_id', 'sha256'], { name: 'attachments_exam_sha', unique: true });
    await queryInterface.addIndex('attachments', ['exam_id', 'created_at'], { name: 'attachments_exam_created' });
    await queryInterface.addIndex('attachments', ['match_status', 'created_at'], { name: 'attachments_match_created' });
    // A matched row has its exam and a held one has none; uploads are always matched.
    await queryInterface.sequelize.query(
      "ALTER TABLE attachments ADD CONSTRAINT attachments_match_exam CHECK ((match_status = 'matched') = (exam_id IS NOT NULL))",
    );
    await queryInterface.sequelize.query(
      "ALTER TABLE attachments ADD CONSTRAINT attachments_upload_matched CHECK (source = 'network' OR match_status = 'matched')",
    );
  },

  async down(queryInterface) {
    await queryInterface.dropTable('attachments');
  },
};
