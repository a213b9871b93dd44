import { readPlotAddress } from '@common/plot-labels';
import jsQR from 'jsqr';
import { useEffect, useRef, useState } from 'react';

/** The plot address in a camera frame, when the frame holds one of our plot labels. */
export function decodePlotLabel(
  rgba: Uint8ClampedArray,
  width: number,
  height: number,
  origin: string,
): { found: 'label'; path: string } | { found: 'other' } | null {
  const code = jsQR(rgba, width, height, { inversionAttempts: 'dontInvert' });
  if (!code) return null;
  const address = readPlotAddress(code.data, origin);
  return address ? { found: 'label', path: address.path } : { found: 'other' };
}

/**
 * "Scan a plot label": the phone's back camera, read frame by frame until a plot label's code
 * shows. Typing the plot number stays beside it for when there is no camera or no light.
 */
export function LabelScanner({ onFound }: { onFound: (path: string) => void }) {
  const [open, setOpen] = useState(false);
  const [message, setMessage] = useState<string | null>(null);
  const video = useRef<HTMLVideoElement>(null);

  useEffect(() => {
    if (!open) return;
    let stream: MediaStream | null = null;
    let frame = 0;
    let stopped = false;
    const canvas = document.createElement('canvas');
    const context = canvas.getContext('2d', { willReadFrequently: true });
    const look = () => {
      if (stopped) return;
      const v = video.current;
      if (v && context && v.readyState >= 2 && v.videoWidth > 0) {
        canvas.width = v.videoWidth;
        canvas.height = v.videoHeight;
        context.drawImage(v, 0, 0);
        const image = context.getImageData(0, 0, canvas.width, canvas.height);
        const result = decodePlotLabel(image.data, image.width, image.height, location.origin);
        if (result?.found === 'label') {
          setOpen(false);
          onFound(result.path);
          return;
        }
        if (result?.found === 'other')
          setMessage('That code is not one of this app’s plot labels.');
      }
      frame = requestAnimationFrame(look);
    };
    (async () => {
      try {
        if (!navigator.mediaDevices?.getUserMedia) throw new Error('no camera');
        stream = await navigator.mediaDevices.getUserMedia({
          video: { facingMode: 'environment' },
          audio: false,
        });
        if (stopped) return stream.getTracks().forEach((t) => t.stop());
        if (video.current) {
          video.current.srcObject = stream;
          await video.current.play().catch(() => {});
        }
        setMessage('Point the camera at the code on the stake.');
        frame = requestAnimationFrame(look);
      } catch {
        setMessage('The camera is not available here: type the plot number instead.');
      }
    })();
    return () => {
      stopped = true;
      cancelAnimationFrame(frame);
      stream?.getTracks().forEach((t) => t.stop());
    };
  }, [open, onFound]);

  return (
    <div className="space-y-2">
      <button
        type="button"
        aria-expanded={open}
        onClick={() => {
          setMessage(null);
          setOpen((o) => !o);
        }}
        className="min-h-11 rounded-lg border border-leaf-700 px-3 font-semibold text-leaf-700"
      >
        {open ? 'Stop scanning' : 'Scan a plot label'}
      </button>
      {open ? (
        <video
          ref={video}
          muted
          playsInline
          aria-label="Camera view for scanning a plot label"
          className="aspect-square w-full max-w-xs rounded-lg bg-ink object-cover"
        />
      ) : null}
      {message ? (
        <p role="status" className="text-sm text-loam-700">
          {message}
        </p>
      ) : null}
    </div>
  );
}
