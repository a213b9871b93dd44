import type { Design } from '@common/contracts/design';

/** Several-sites trials show one site at a time. */
export function SitePicker({
  design,
  value,
  onChange,
}: {
  design: Design;
  value: string;
  onChange: (siteId: string) => void;
}) {
  if (design.sites.length < 2) return null;
  return (
    <label className="flex flex-wrap items-center gap-2 text-sm font-medium">
      Site
      <select
        className="min-h-11 rounded-lg border border-leaf-300 bg-white px-2"
        value={value}
        onChange={(e) => onChange(e.target.value)}
      >
        {design.sites.map((s) => (
          <option key={s.id} value={s.id}>
            {s.name}
          </option>
        ))}
      </select>
    </label>
  );
}

export const firstSiteWithPlots = (design: Design) =>
  design.sites.find((s) => design.plots.some((p) => p.siteId === s.id))?.id ??
  design.sites[0]?.id ??
  '';
