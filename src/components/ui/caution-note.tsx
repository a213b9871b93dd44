import { type CautionId, cautions } from '@common/cautions';

/** A safety caution in one look everywhere: the shared text, and a pointer to local rules. */
export function CautionNote({ id, className = '' }: { id: CautionId; className?: string }) {
  const caution = cautions[id];
  return (
    <aside
      aria-label={`Caution: ${caution.title}`}
      className={`caution-note rounded-lg border-l-4 border-pod-500 bg-straw-100 p-3 text-sm ${className}`}
    >
      <p className="font-semibold text-loam-700">
        <span aria-hidden>⚠ </span>
        {caution.title}
      </p>
      <ul className="mt-1 list-disc space-y-0.5 pl-5">
        {caution.points.map((p) => (
          <li key={p}>{p}</li>
        ))}
      </ul>
    </aside>
  );
}
