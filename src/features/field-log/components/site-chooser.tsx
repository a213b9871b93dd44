/** The site a round is at: one line when the grower has one site, else a button per site. */
export function SiteChooser({
  sites,
  siteId,
  onChoose,
}: {
  sites: { id: string; name: string }[];
  siteId: string | null;
  onChoose: (siteId: string) => void;
}) {
  if (sites.length === 1)
    return (
      <p className="text-sm text-loam-700">
        Site: <span className="font-semibold text-leaf-900">{sites[0]!.name}</span>
      </p>
    );
  return (
    <section aria-labelledby="site-heading" className="rounded-xl bg-white p-3 shadow-sm">
      <h2 id="site-heading" className="text-lg font-semibold text-leaf-900">
        Site
      </h2>
      <div role="group" aria-label="Site" className="mt-2 flex flex-wrap gap-2">
        {sites.map((s) => (
          <button
            key={s.id}
            type="button"
            aria-pressed={s.id === siteId}
            onClick={() => onChoose(s.id)}
            className={`min-h-11 rounded-lg border px-3 font-semibold ${
              s.id === siteId
                ? 'border-leaf-700 bg-leaf-700 text-white'
                : 'border-leaf-300 bg-white'
            }`}
          >
            {s.name}
          </button>
        ))}
      </div>
    </section>
  );
}
