import { afterEach, vi } from 'vitest';

// A stray console.error is a bug somewhere: fail the test that caused it.
const calls: unknown[][] = [];
const original = console.error;
console.error = (...args: unknown[]) => {
  calls.push(args);
  original(...args);
};

afterEach(() => {
  if (calls.length > 0) {
    const first = calls.map((c) => c.map(String).join(' ')).join('\n');
    calls.length = 0;
    throw new Error(`console.error was called during the test:\n${first}`);
  }
  vi.restoreAllMocks();
});
