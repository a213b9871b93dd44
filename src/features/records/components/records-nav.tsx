import { NavLink } from 'react-router-dom';

const links = [
  ['harvests', 'Harvest log'],
  ['observations', 'Observation log'],
  ['completeness', 'Completeness'],
  ['files', 'Import and export'],
  ['audit', 'Audit log'],
] as const;

export function RecordsNav({ slug }: { slug: string }) {
  return (
    <nav aria-label="Records" className="flex gap-1 overflow-x-auto">
      {links.map(([path, label]) => (
        <NavLink
          key={path}
          to={`/t/${slug}/records/${path}`}
          className={({ isActive }) =>
            `inline-flex min-h-11 shrink-0 items-center rounded-lg px-3 font-medium ${isActive ? 'bg-leaf-100 text-leaf-900' : 'text-leaf-700 hover:bg-leaf-50'}`
          }
        >
          {label}
        </NavLink>
      ))}
    </nav>
  );
}
