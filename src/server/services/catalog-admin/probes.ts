import { Op, type Transaction } from 'sequelize';
import { db } from '../../../db/connection';
import { Probe, Scanner } from '../../../db/models';
import type { ActiveChange, ActiveChangeResult, ProbeFields, ProbeRow, Versioned } from '../../../lib/schemas/catalog-admin';
import type { SessionUser } from '../../../lib/session-user';
import { zonedDate } from '../../../lib/time';
import { HttpError, ruleBroken } from '../../http/errors';
import { clinicProfile } from '../settings';
import { type Entity, NAMES, clash, badInput, lockVersioned, saveChanges, audited } from './shared';

/** Probes: kind, model label, serial number, band, endocavitary, service dates. */

const mhz = (value: number) => Math.round(value * 100) / 100;
const inServiceOn = (p: Pick<ProbeFields, 'inServiceFrom' | 'inServiceTo'>, today: string) => p.inServiceFrom <= today && (p.inServiceTo === null || today <= p.inServiceTo);

function probeRow(p: Probe, scannerName: string | null, today: string): ProbeRow {
  return {
    id: p.id,
    kind: p.kind,
    modelLabel: p.modelLabel,
    serialNumber: p.serialNumber,
    // FLOAT columns read back as the nearest single-precision value (12.3 → 12.30000019…).
    minFrequencyMhz: mhz(p.minFrequencyMhz),
    maxFrequencyMhz: mhz(p.maxFrequencyMhz),
    endocavitary: p.endocavitary,
    scannerId: p.scannerId ?? null,
    scannerName,
    inServiceFrom: p.inServiceFrom,
    inServiceTo: p.inServiceTo,
    inService: inServiceOn(p, today),
    version: p.version,
  };
}

async function clinicToday(transaction?: Transaction): Promise<string> {
  return zonedDate(new Date(), (await clinicProfile(transaction)).timeZone);
}

export async function listProbes(): Promise<ProbeRow[]> {
  const [probes, scanners, today] = await Promise.all([Probe.findAll({ order: [['modelLabel', 'ASC'], ['id', 'ASC']] }), Scanner.findAll(), clinicToday()]);
  const names = new Map(scanners.map((s) => [s.id, s.name]));
  return probes.map((p) => probeRow(p, p.scannerId ? (names.get(p.scannerId) ?? null) : null, today));
}

async function checkSerial(serialNumber: string, id: number | null, transaction: Transaction): Promise<void> {
  const other = await Probe.findOne({ where: { serialNumber, ...(id ? { id: { [Op.ne]: id } } : {}) }, transaction });
  if (other) throw clash(`Serial number ${other.serialNumber} is already recorded for the probe ${other.modelLabel}.`, 'serialNumber', 'Already recorded for another probe.');
}

async function scannerName(scannerId: number | null, transaction: Transaction): Promise<string | null> {
  if (scannerId === null) return null;
  const scanner = await Scanner.findByPk(scannerId, { transaction });
  if (!scanner) throw badInput('scannerId', 'No such scanner.');
  return scanner.name;
}

export async function createProbe(actor: SessionUser, input: ProbeFields, requestId: string): Promise<ProbeRow> {
  return db().transaction(async (transaction) => {
    const name = await scannerName(input.scannerId, transaction);
    await checkSerial(input.serialNumber, null, transaction);
    const probe = await Probe.create({ ...input }, { transaction });
    await audited('probe', 'create', probe.id, { kind: probe.kind, scannerId: probe.scannerId ?? null }, { actor, requestId }, transaction);
    return probeRow(probe, name, await clinicToday(transaction));
  });
}

export async function updateProbe(actor: SessionUser, id: number, input: Versioned<ProbeFields>, requestId: string): Promise<ProbeRow> {
  return db().transaction(async (transaction) => {
    const probe = await lockVersioned(Probe, 'probe', id, input.version, transaction);
    const name = await scannerName(input.scannerId, transaction);
    if (input.serialNumber !== probe.serialNumber) await checkSerial(input.serialNumber, id, transaction);
    const { version: _version, ...fields } = input;
    await saveChanges(probe, 'probe', fields, { actor, requestId }, transaction);
    return probeRow(probe, name, await clinicToday(transaction));
  });
}

/**
 * A probe has no active flag: its service dates say whether it is in use. Taking it out of
 * service makes today its last day; returning it to service clears the end date.
 */
export async function setProbeActive(actor: SessionUser, id: number, input: ActiveChange, requestId: string): Promise<ActiveChangeResult<ProbeRow>> {
  return db().transaction(async (transaction) => {
    const probe = await lockVersioned(Probe, 'probe', id, input.version, transaction);
    const today = await clinicToday(transaction);
    const ending = probe.inServiceTo !== null && probe.inServiceTo <= today;
    if (!input.active && !ending) {
      if (probe.inServiceFrom > today) {
        throw ruleBroken(`This probe enters service on ${probe.inServiceFrom}. Change its dates instead.`, { inServiceFrom: 'Not in service yet.' });
      }
      await probe.update({ inServiceTo: today, version: probe.version + 1 }, { transaction });
      await audited('probe', 'deactivate', id, { inServiceTo: today }, { actor, requestId }, transaction);
    } else if (input.active && probe.inServiceTo !== null) {
      await probe.update({ inServiceTo: null, version: probe.version + 1 }, { transaction });
      await audited('probe', 'reactivate', id, { inServiceTo: null }, { actor, requestId }, transaction);
    }
    return { row: probeRow(probe, await scannerName(probe.scannerId ?? null, transaction), today) };
  });
}

/** The answer to a DELETE: catalog rows stay for the exams that name them (405, with the way out). */
export function deletingRefused(entity: Entity): HttpError {
  const what = NAMES[entity];
  return new HttpError(405, 'RULE', `A ${what} is never deleted, so past exams keep what they were booked with. ${entity === 'probe' ? 'Take it out of service' : 'Deactivate it'} instead.`);
}
