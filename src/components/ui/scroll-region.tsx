import type { ReactNode } from 'react';

/**
 * A wide table's sideways-scrolling frame. It takes keyboard focus (arrow keys then scroll it) and
 * carries a name, so a keyboard or screen-reader user can reach what a narrow screen cuts off.
 */
export function ScrollRegion({
  label,
  className = '',
  children,
}: {
  label: string;
  className?: string;
  children: ReactNode;
}) {
  return (
    <div role="region" aria-label={label} tabIndex={0} className={`overflow-x-auto ${className}`}>
      {children}
    </div>
  );
}
