/**
 * The service worker keeps the whole app on the device so a grower can open the field log with
 * no signal (see vite.config.ts). It is installed for signed-in people only: a reader of a
 * public sheet should not download the app they will never use offline.
 */
import { registerSW } from 'virtual:pwa-register';

let installed = false;

export function keepAppOnDevice(): void {
  if (installed || !('serviceWorker' in navigator)) return;
  installed = true;
  void registerSW({ immediate: true });
}
