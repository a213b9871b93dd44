import { Link } from 'react-router-dom';

/** The way back from a field-log page: the trial, then the field log. */
export function FieldLogCrumbs({ slug, title }: { slug: string; title: string }) {
  return (
    <p className="text-sm uppercase tracking-wide text-loam-700">
      <Link to={`/t/${slug}`} className="underline">
        {title}
      </Link>{' '}
      ·{' '}
      <Link to={`/t/${slug}/log`} className="underline">
        Field log
      </Link>
    </p>
  );
}
