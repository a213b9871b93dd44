import type { VarietyRecord } from '@common/contracts/varieties';
import { useState } from 'react';
import { ErrorPanel } from '@/components/ui/error-panel';
import { useSetVarietyCover } from '../api/save-variety';

const NONE = '';

/** The coordinator picks the variety's own cover from the photos its trials hold. */
export function CoverPicker({ record }: { record: VarietyRecord }) {
  const current = record.variety.cover?.id ?? NONE;
  const [chosen, setChosen] = useState(current);
  const save = useSetVarietyCover(record.variety.slug);
  const name = record.variety.name;
  return (
    <form
      className="mt-4 rounded-lg bg-white p-3 shadow-sm"
      onSubmit={(e) => {
        e.preventDefault();
        save.mutate(chosen === NONE ? null : chosen);
      }}
    >
      <fieldset>
        <legend className="font-semibold text-leaf-900">Cover photo</legend>
        <ul className="mt-2 grid grid-cols-2 gap-3 sm:grid-cols-4">
          <li>
            <label className="flex min-h-11 items-center gap-2">
              <input
                type="radio"
                name="cover"
                value={NONE}
                checked={chosen === NONE}
                onChange={() => setChosen(NONE)}
              />
              No cover
            </label>
          </li>
          {record.photos.map((p) => (
            <li key={p.id}>
              <label className="flex flex-col gap-1">
                <img
                  src={p.thumbUrl}
                  alt=""
                  className="aspect-square w-full rounded object-cover"
                  loading="lazy"
                />
                <span className="flex min-h-11 items-center gap-2 text-sm">
                  <input
                    type="radio"
                    name="cover"
                    value={p.id}
                    checked={chosen === p.id}
                    onChange={() => setChosen(p.id)}
                  />
                  {p.caption || `${name}, ${p.season}`}
                </span>
              </label>
            </li>
          ))}
        </ul>
      </fieldset>
      {save.error ? <ErrorPanel error={save.error} title="The cover was not saved" /> : null}
      <button
        type="submit"
        disabled={save.isPending || chosen === current}
        className="mt-3 inline-flex min-h-11 items-center rounded-lg bg-leaf-700 px-4 font-semibold text-white hover:bg-leaf-900 disabled:opacity-60"
      >
        {save.isPending ? 'Saving…' : 'Save cover'}
      </button>
    </form>
  );
}
