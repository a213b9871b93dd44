// jsdom tests: a real IndexedDB implementation in memory, and a clean DOM after each test.
import 'fake-indexeddb/auto';
import { cleanup, configure } from '@testing-library/react';
import { afterEach } from 'vitest';

// findBy*/waitFor wait for what the page does, not for a clock: the ceiling only has to be
// far above how long a busy machine takes, so a slow run is not reported as a wrong page.
configure({ asyncUtilTimeout: 15_000 });

afterEach(() => {
  cleanup();
});
