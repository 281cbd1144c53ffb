import type { Sequelize } from 'sequelize';
import { Attachment } from './Attachment';
import { AuditEvent } from './AuditEvent';
import { Exam } from './Exam';
import { ExamType } from './ExamType';
import { OutboxMessage } from './OutboxMessage';
import { Patient } from './Patient';
import { Payment } from './Payment';
import { PaymentEvent } from './PaymentEvent';
import { Probe } from './Probe';
import { ProcedureStep } from './ProcedureStep';
import { ReferenceRangeRow } from './ReferenceRangeRow';
import { Referrer } from './Referrer';
import { Report } from './Report';
import { ReportAddendum } from './ReportAddendum';
import { ReportCommunication } from './ReportCommunication';
import { ReportLink } from './ReportLink';
import { Room } from './Room';
import { Scanner } from './Scanner';
import { ScannerValue } from './ScannerValue';
import { Sequence } from './Sequence';
import { Setting } from './Setting';
import { User } from './User';

export { Attachment, AuditEvent, Exam, ExamType, OutboxMessage, Patient, Payment, PaymentEvent, Probe, ProcedureStep, ReferenceRangeRow, Referrer, Report, ReportAddendum, ReportCommunication, ReportLink, Room, Scanner, ScannerValue, Sequence, Setting, User };

/** Registers every model and association on one Sequelize instance. */
export function initModels(sequelize: Sequelize): void {
  for (const model of [Attachment, AuditEvent, Exam, ExamType, OutboxMessage, Patient, Payment, PaymentEvent, Probe, ProcedureStep, ReferenceRangeRow, Referrer, Report, ReportAddendum, ReportCommunication, ReportLink, Room, Scanner, ScannerValue, Sequence, Setting, User]) {
    model.initModel(sequelize);
  }
  User.belongsTo(Referrer, { foreignKey: 'referrerId', as: 'referrer' });
  Scanner.belongsTo(Room, { foreignKey: 'roomId', as: 'room' });
  Room.hasMany(Scanner, { foreignKey: 'roomId', as: 'scanners' });
  Probe.belongsTo(Scanner, { foreignKey: 'scannerId', as: 'scanner' });
  Exam.belongsTo(Patient, { foreignKey: 'patientId', as: 'patient' });
  Exam.belongsTo(ExamType, { foreignKey: 'examTypeId', as: 'examType' });
  Exam.belongsTo(Referrer, { foreignKey: 'referrerId', as: 'referrer' });
  Exam.belongsTo(Room, { foreignKey: 'roomId', as: 'room' });
  Exam.belongsTo(Scanner, { foreignKey: 'scannerId', as: 'scanner' });
  Exam.belongsTo(User, { foreignKey: 'sonographerId', as: 'sonographer' });
  Patient.hasMany(Exam, { foreignKey: 'patientId', as: 'exams' });
  Exam.hasMany(Payment, { foreignKey: 'examId', as: 'payments' });
  Payment.belongsTo(Exam, { foreignKey: 'examId', as: 'exam' });
  Exam.hasMany(OutboxMessage, { foreignKey: 'examId', as: 'messages' });
  Exam.hasMany(Attachment, { foreignKey: 'examId', as: 'attachments' });
  Attachment.belongsTo(Exam, { foreignKey: 'examId', as: 'exam' });
  Attachment.belongsTo(User, { foreignKey: 'uploadedBy', as: 'uploader' });
  Exam.hasOne(Report, { foreignKey: 'examId', as: 'report' });
  Report.belongsTo(Exam, { foreignKey: 'examId', as: 'exam' });
  Exam.hasMany(ProcedureStep, { foreignKey: 'examId', as: 'procedureSteps' });
  ScannerValue.belongsTo(Attachment, { foreignKey: 'attachmentId', as: 'attachment' });
}
