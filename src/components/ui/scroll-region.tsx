import { type ReactNode, useEffect, useId, useRef, useState } from 'react';

/**
 * Whether the element's content is wider than the element, and whether it is scrolled to its
 * right end (re-checked as either resizes and as it scrolls).
 */
function useSidewaysOverflow(ref: React.RefObject<HTMLElement | null>, watch: boolean) {
  const [state, setState] = useState({ overflows: false, atEnd: true });
  useEffect(() => {
    const el = ref.current;
    if (!watch || !el) return;
    // Called on every scroll event: a render only when either answer changes.
    const check = () => {
      const overflows = el.scrollWidth > el.clientWidth + 1;
      const atEnd = el.scrollLeft + el.clientWidth >= el.scrollWidth - 1;
      setState((s) => (s.overflows === overflows && s.atEnd === atEnd ? s : { overflows, atEnd }));
    };
    check();
    el.addEventListener('scroll', check, { passive: true });
    const observer = typeof ResizeObserver === 'undefined' ? null : new ResizeObserver(check);
    observer?.observe(el);
    for (const child of el.children) observer?.observe(child);
    return () => {
      el.removeEventListener('scroll', check);
      observer?.disconnect();
    };
  }, [ref, watch]);
  return state;
}

/**
 * A wide table's sideways-scrolling frame. It takes keyboard focus (arrow keys then scroll it) and
 * carries a name, so a keyboard or screen-reader user can reach what a narrow screen cuts off.
 * With a `hint`, a frame whose content does not fit says so in words (read with the frame's name)
 * and shades its right edge until scrolled to the end, so a sighted reader on a phone knows there is more to the side.
 */
export function ScrollRegion({
  label,
  className = '',
  hint,
  children,
}: {
  label: string;
  className?: string;
  hint?: string;
  children: ReactNode;
}) {
  const ref = useRef<HTMLDivElement>(null);
  const hintId = useId();
  const { overflows, atEnd } = useSidewaysOverflow(ref, hint !== undefined);
  const frame = (
    <div
      ref={ref}
      role="region"
      aria-label={label}
      aria-describedby={hint && overflows ? hintId : undefined}
      tabIndex={0}
      className={`overflow-x-auto ${className}`}
    >
      {children}
    </div>
  );
  if (!hint) return frame;
  return (
    <div>
      <div className="relative">
        {frame}
        {overflows && !atEnd ? (
          <div
            aria-hidden="true"
            data-scroll-shade=""
            className="pointer-events-none absolute inset-y-0 right-0 w-8 rounded-r-lg bg-linear-to-l from-loam-700/30 to-transparent"
          />
        ) : null}
      </div>
      {overflows ? (
        <p id={hintId} className="mt-1 text-xs text-loam-700">
          {hint} <span aria-hidden="true">→</span>
        </p>
      ) : null}
    </div>
  );
}
