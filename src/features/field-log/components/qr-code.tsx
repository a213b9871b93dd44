import QRCode from 'qrcode';
import { useMemo } from 'react';

/**
 * A QR code drawn as one SVG path of its dark modules, with the standard quiet zone of four
 * modules (ISO/IEC 18004) so a phone finds it on a printed stake label.
 */
export function QrCode({
  text,
  label,
  className,
}: {
  text: string;
  label: string;
  className?: string;
}) {
  const { size, path } = useMemo(() => {
    const { modules } = QRCode.create(text, { errorCorrectionLevel: 'M' });
    const quiet = 4;
    let d = '';
    for (let y = 0; y < modules.size; y++)
      for (let x = 0; x < modules.size; x++)
        if (modules.get(x, y)) d += `M${x + quiet} ${y + quiet}h1v1h-1z`;
    return { size: modules.size + 2 * quiet, path: d };
  }, [text]);
  return (
    <svg
      role="img"
      aria-label={label}
      viewBox={`0 0 ${size} ${size}`}
      shapeRendering="crispEdges"
      className={className}
    >
      <rect width={size} height={size} fill="#fff" />
      <path d={path} fill="#000" />
    </svg>
  );
}
