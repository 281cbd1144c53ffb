import type { InputHTMLAttributes, Ref } from 'react';

type Props = Omit<InputHTMLAttributes<HTMLInputElement>, 'type' | 'role'> & {
  id: string;
  label: string;
  hint?: string;
  ref?: Ref<HTMLInputElement>;
};

/** An on/off setting: a checkbox announced as a switch, its label beside it and a hint below. */
export function Switch({ id, label, hint, ref, ...input }: Props) {
  return (
    <div className="flex items-start gap-3">
      <input
        id={id}
        ref={ref}
        type="checkbox"
        role="switch"
        aria-describedby={hint ? `${id}-hint` : undefined}
        className="relative mt-0.5 h-5 w-9 shrink-0 cursor-pointer appearance-none rounded-full bg-ink-200 transition-colors before:absolute before:top-0.5 before:left-0.5 before:h-4 before:w-4 before:rounded-full before:bg-white before:shadow before:transition-transform checked:bg-crest-600 checked:before:translate-x-4 disabled:cursor-not-allowed disabled:opacity-50"
        {...input}
      />
      <div className="min-w-0">
        <label htmlFor={id} className="text-sm font-medium text-ink-800">{label}</label>
        {hint && <p id={`${id}-hint`} className="mt-0.5 text-xs text-ink-500">{hint}</p>}
      </div>
    </div>
  );
}
