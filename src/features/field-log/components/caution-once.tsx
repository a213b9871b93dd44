import { type CautionId, cautions } from '@common/cautions';
import { CautionNote } from '@/components/ui/caution-note';

/** A caution in full the first time in a session, then one line that opens it again. */
export function CautionOnce({ id, seen }: { id: CautionId; seen: boolean }) {
  if (!seen) return <CautionNote id={id} className="mb-3" />;
  return (
    <details className="mb-3 text-sm">
      <summary className="min-h-11 cursor-pointer content-center font-semibold text-loam-700 underline">
        <span aria-hidden>⚠ </span>
        {cautions[id].title}: read the caution again
      </summary>
      <CautionNote id={id} />
    </details>
  );
}
