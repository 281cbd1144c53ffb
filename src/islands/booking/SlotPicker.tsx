import { useQuery } from '@tanstack/react-query';
import { slotsQuery } from '../../lib/queries/exams';
import { formatDay } from '../../lib/time';

interface Props {
  examTypeId?: number;
  roomId?: number;
  scannerId?: number;
  sonographerId?: number;
  from?: string;
  excludeExamId?: number;
  selected: string | null;
  onPick: (startIso: string) => void;
}

/** The next free starts for the chosen exam type, room, scanner and sonographer, as buttons. */
export function SlotPicker(p: Props) {
  const { data, isFetching, isError, error } = useQuery(slotsQuery({ examTypeId: p.examTypeId, roomId: p.roomId, scannerId: p.scannerId, sonographerId: p.sonographerId, from: p.from, excludeExamId: p.excludeExamId }));
  if (!p.examTypeId || !p.roomId || !p.scannerId || !p.sonographerId) {
    return <p className="text-sm text-ink-500">Choose the exam type, room, scanner and sonographer to see free times.</p>;
  }
  if (isError) return <p className="field-error" role="alert">{(error as Error).message}</p>;
  const byDay = new Map<string, Array<{ start: string; time: string }>>();
  for (const s of data?.slots ?? []) byDay.set(s.day, [...(byDay.get(s.day) ?? []), s]);
  return (
    <div aria-busy={isFetching}>
      <p className="field-label" id="slot-label">Next free times</p>
      {data && data.slots.length === 0 && <p className="text-sm text-ink-500">No free time in the next two weeks for this combination.</p>}
      <div className="mt-1 space-y-2" role="group" aria-labelledby="slot-label">
        {[...byDay].map(([day, slots]) => (
          <div key={day} className="flex flex-wrap items-center gap-2">
            <span className="w-32 text-xs font-semibold text-ink-600">{formatDay(day)}</span>
            {slots.map((s) => (
              <button key={s.start} type="button" aria-pressed={p.selected === s.start}
                className={`rounded-md px-2.5 py-1 text-sm ring-1 ${p.selected === s.start ? 'bg-crest-600 text-white ring-crest-700' : 'bg-white text-ink-800 ring-ink-200 hover:bg-crest-50'}`}
                onClick={() => p.onPick(s.start)}>
                {s.time}
              </button>
            ))}
          </div>
        ))}
      </div>
    </div>
  );
}
