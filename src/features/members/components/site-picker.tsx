/** Which of the trial's sites a grower records at; none ticked means every site. */
export function SitePicker({
  sites,
  value,
  onChange,
  legend = 'Sites this grower records at',
}: {
  sites: { id: string; name: string }[];
  value: string[];
  onChange: (next: string[]) => void;
  legend?: string;
}) {
  if (!sites.length) return null;
  return (
    <fieldset className="flex flex-col gap-1">
      <legend className="font-medium">{legend}</legend>
      <p className="text-sm text-loam-700">Tick none for every site.</p>
      {sites.map((s) => (
        <label key={s.id} className="flex min-h-11 items-center gap-3">
          <input
            type="checkbox"
            className="h-5 w-5 accent-leaf-700"
            checked={value.includes(s.id)}
            onChange={(e) =>
              onChange(e.target.checked ? [...value, s.id] : value.filter((id) => id !== s.id))
            }
          />
          {s.name}
        </label>
      ))}
    </fieldset>
  );
}
