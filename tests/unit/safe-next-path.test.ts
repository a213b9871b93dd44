/**
 * Where sign-in may send someone afterwards. The cases follow the WHATWG URL Standard's basic
 * URL parser (https://url.spec.whatwg.org/#concept-basic-url-parser): it removes every ASCII
 * tab and newline from the input, and for http(s) addresses reads `\` as `/`, so "/\t/x" and
 * "/\x" both mean "//x", another host.
 */
import { describe, expect, it } from 'vitest';
import { safeNextPath } from '../../common/contracts/auth';

describe('the page that follows sign-in', () => {
  it('keeps a path on this site, with its query and fragment', () => {
    expect(safeNextPath('/t/larkhaven-okra-2026/analysis?trait=yield#letters')).toBe(
      '/t/larkhaven-okra-2026/analysis?trait=yield#letters',
    );
  });

  it('refuses other sites however they are spelled', () => {
    for (const next of [
      'https://elsewhere.example/',
      '//elsewhere.example/',
      '/\\elsewhere.example/',
      '/\t/elsewhere.example/',
      '/\n/elsewhere.example/',
      '/\r\n/elsewhere.example',
      '\t//elsewhere.example',
      'javascript:alert(1)',
    ])
      expect(safeNextPath(next), JSON.stringify(next)).toBe('/');
  });

  it('drops tabs and newlines inside a local path as a browser would', () => {
    expect(safeNextPath('/t/okra\t-2026\n')).toBe('/t/okra-2026');
  });

  it('escapes other control characters instead of passing them on raw', () => {
    expect(safeNextPath('/t/okra\u0001x')).toBe('/t/okra%01x');
  });

  it('falls back when there is nothing to follow', () => {
    expect(safeNextPath(null)).toBe('/');
    expect(safeNextPath('', '/trials')).toBe('/trials');
  });
});
