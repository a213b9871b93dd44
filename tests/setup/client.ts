// jsdom tests: a real IndexedDB implementation in memory, and a clean DOM after each test.
import 'fake-indexeddb/auto';
import { cleanup } from '@testing-library/react';
import { afterEach } from 'vitest';

afterEach(() => {
  cleanup();
});
