/**
 * A plot label's QR code, as qrcode draws it, read back by jsQR the way the scanner reads a
 * camera frame: an independent decoder of the QR standard (ISO/IEC 18004) agrees on the plot's
 * address.
 */
import QRCode from 'qrcode';
import { describe, expect, it } from 'vitest';
import { plotAddress } from '../../common/plot-labels';
import { decodePlotLabel } from '../../src/features/field-log/components/label-scanner';

/** The code's modules as an RGBA image: `scale` pixels per module, four modules of quiet zone. */
function render(text: string, scale = 4) {
  const { modules } = QRCode.create(text, { errorCorrectionLevel: 'M' });
  const size = (modules.size + 8) * scale;
  const rgba = new Uint8ClampedArray(size * size * 4).fill(255);
  for (let y = 0; y < size; y++)
    for (let x = 0; x < size; x++) {
      const mx = Math.floor(x / scale) - 4;
      const my = Math.floor(y / scale) - 4;
      if (mx >= 0 && my >= 0 && mx < modules.size && my < modules.size && modules.get(mx, my)) {
        const i = (y * size + x) * 4;
        rgba[i] = rgba[i + 1] = rgba[i + 2] = 0;
      }
    }
  return { rgba, size };
}

describe('scanning a plot label', () => {
  const origin = 'http://127.0.0.1:3130';
  const plotId = '4b1c7d2e-8f90-4a6b-b3c5-d7e9f1a2b3c4';

  it('finds the plot path in a frame that shows the label', () => {
    const { rgba, size } = render(plotAddress(origin, 'harrow-bean-trial', plotId));
    expect(decodePlotLabel(rgba, size, size, origin)).toEqual({
      found: 'label',
      path: `/t/harrow-bean-trial/log?plot=${plotId}`,
    });
  });

  it('tells a code of another address apart, and finds nothing in a blank frame', () => {
    const { rgba, size } = render('https://elsewhere.example.net/plots/7');
    expect(decodePlotLabel(rgba, size, size, origin)).toEqual({ found: 'other' });
    const blank = new Uint8ClampedArray(size * size * 4).fill(255);
    expect(decodePlotLabel(blank, size, size, origin)).toBeNull();
  });
});
