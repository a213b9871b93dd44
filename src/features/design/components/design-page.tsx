import type { ReactNode } from 'react';
import { Link, NavLink, useParams } from 'react-router-dom';
import { ErrorPanel } from '@/components/ui/error-panel';
import { Spinner } from '@/components/ui/spinner';
import type { Design } from '@common/contracts/design';
import { useDesign } from '../api/get-design';

export const designPages = [
  ['settings', 'Settings'],
  ['entries', 'Entries'],
  ['sites', 'Sites'],
  ['traits', 'Traits'],
  ['layout', 'Layout'],
  ['map', 'Planting map'],
  ['field-sheet', 'Field sheet'],
  ['planting', 'What was planted'],
] as const;

const tabClass = ({ isActive }: { isActive: boolean }) =>
  `inline-flex min-h-11 shrink-0 items-center rounded-lg px-3 text-sm font-medium ${isActive ? 'bg-leaf-700 text-white' : 'bg-white text-leaf-700 hover:bg-leaf-50'}`;

/** The frame of every design page: the trial's name, the design tabs, loading and errors. */
export function DesignPage({
  title,
  children,
}: {
  title: string;
  children: (design: Design, slug: string) => ReactNode;
}) {
  const { slug = '' } = useParams();
  const { data, isPending, error } = useDesign(slug);
  if (isPending) return <Spinner label="Loading the trial design…" />;
  if (error) return <ErrorPanel error={error} />;
  return (
    <div>
      <div className="no-print">
        <p className="text-sm text-loam-700">
          <Link to={`/t/${slug}`} className="font-semibold text-leaf-700 underline">
            {data.title}
          </Link>{' '}
          · {data.crop} · {data.season}
        </p>
        <nav aria-label="Trial design" className="mt-2 flex gap-1 overflow-x-auto pb-1">
          {designPages.map(([path, label]) => (
            <NavLink key={path} to={`/t/${slug}/${path}`} className={tabClass}>
              {label}
            </NavLink>
          ))}
        </nav>
        <h1 className="mt-3 text-3xl font-semibold text-leaf-900">{title}</h1>
        {!data.canEdit ? (
          <p className="mt-2 rounded-lg bg-straw-100 p-2 text-sm">
            Only the trial lead can change the design; you can read it.
          </p>
        ) : null}
      </div>
      <div className="mt-4">{children(data, slug)}</div>
    </div>
  );
}
